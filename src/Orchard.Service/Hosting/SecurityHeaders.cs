namespace Orchard.Service.Hosting;

/// <summary>
/// Headers on every answer: no MIME sniffing, no referrer to other origins (same-origin: the page's own
/// form posts keep their Origin header, which sign-in checks), never framed (frame-ancestors 'none' and
/// X-Frame-Options DENY), resources for this origin only; the review page's Content-Security-Policy allows
/// its own script and style files and nothing inline (the page has no inline script or style). API answers
/// are not stored by caches unless an endpoint says otherwise (a schedule is revalidated by its ETag).
/// </summary>
public sealed class SecurityHeaders(RequestDelegate next)
{
    public const string PagePolicy = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self'; connect-src 'self'; form-action 'self'; frame-ancestors 'none'; base-uri 'none'";

    public const string DocumentPolicy = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'";

    public Task InvokeAsync(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        context.Response.OnStarting(() =>
        {
            var headers = context.Response.Headers;
            var path = context.Request.Path;
            headers.XContentTypeOptions = "nosniff";
            headers["Referrer-Policy"] = "same-origin";
            headers.XFrameOptions = "DENY";
            headers["Cross-Origin-Resource-Policy"] = "same-origin";
            headers.ContentSecurityPolicy = path.StartsWithSegments("/review", StringComparison.Ordinal) ? PagePolicy : DocumentPolicy;
            if (string.IsNullOrEmpty(headers.CacheControl))
            {
                headers.CacheControl = path.StartsWithSegments("/review", StringComparison.Ordinal) ? "no-cache" : "no-store";
            }

            return Task.CompletedTask;
        });
        return next(context);
    }
}
