namespace Orchard.Service.Review;

/// <summary>
/// Is an unsafe request to the page's own endpoints (sign-in, sign-out) from the page itself? The browser
/// says so: <c>Sec-Fetch-Site</c>, when sent, must be <c>same-origin</c> (another port of the same host is
/// only <c>same-site</c>), and <c>Origin</c>, when sent, must name this host and port. A request with
/// neither is refused too: every browser that can show the page sends at least one, and other clients use
/// an API key. The antiforgery token is checked besides this (both are needed: a page on the same host can
/// set cookies for it, so a token alone could be planted).
/// </summary>
public static class PageRequests
{
    public static bool FromThisOrigin(HttpRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        var site = request.Headers["Sec-Fetch-Site"].ToString();
        if (site.Length > 0 && !string.Equals(site, "same-origin", StringComparison.OrdinalIgnoreCase))
        {
            return false;
        }

        var origin = request.Headers.Origin.ToString();
        if (origin == "null")
        {
            // A browser sends "null" when a referrer policy hides the origin; only the fetch metadata can vouch then.
            return site.Length > 0;
        }

        if (origin.Length > 0)
        {
            // Only the authority is compared: behind a TLS-terminating proxy the scheme seen here differs.
            return Uri.TryCreate(origin, UriKind.Absolute, out var uri)
                && string.Equals(uri.Authority, request.Host.Value, StringComparison.OrdinalIgnoreCase);
        }

        return site.Length > 0;
    }
}
