using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>
/// An HTTP client that behaves like the review page in a browser: it keeps cookies, does not follow
/// redirects, reads the antiforgery token from /review/session and sends sign-in and sign-out as the page's
/// forms with the page's Origin and Sec-Fetch-Site (unless told to forge them).
/// </summary>
public sealed class PageClient : IDisposable
{
    private readonly HttpClientHandler handler;

    public PageClient(Uri baseAddress)
    {
        Jar = new CookieContainer();
        handler = new HttpClientHandler { CookieContainer = Jar, UseCookies = true, AllowAutoRedirect = false };
        Http = new HttpClient(handler) { BaseAddress = baseAddress, Timeout = TimeSpan.FromSeconds(60) };
    }

    public HttpClient Http { get; }

    public CookieContainer Jar { get; }

    public string Origin => Http.BaseAddress!.GetLeftPart(UriPartial.Authority);

    /// <summary>The review cookie as the browser holds it (null when there is none).</summary>
    public string? SessionCookie => Jar.GetCookies(Http.BaseAddress!)["orchard_review"]?.Value;

    public async Task<JsonElement> SessionAsync()
    {
        using var response = await Http.GetAsync(new Uri("/review/session", UriKind.Relative));
        response.EnsureSuccessStatusCode();
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    public async Task<HttpResponseMessage> SignInAsync(string key, string? origin = "", string? fetchSite = "same-origin", bool withToken = true)
    {
        var token = (await SessionAsync()).GetProperty("antiforgery").GetString()!;
        var fields = new Dictionary<string, string> { ["key"] = key };
        if (withToken)
        {
            fields["_af"] = token;
        }

        return await PostFormAsync("/review/sign-in", fields, origin, fetchSite);
    }

    public async Task<HttpResponseMessage> SignOutAsync(string? origin = "", string? fetchSite = "same-origin")
    {
        var token = (await SessionAsync()).GetProperty("antiforgery").GetString()!;
        return await PostFormAsync("/review/sign-out", new Dictionary<string, string> { ["_af"] = token }, origin, fetchSite);
    }

    /// <summary>A GET carrying only the given review cookie (as a replayed or stolen cookie would be).</summary>
    public async Task<HttpStatusCode> GetWithCookieAsync(string path, string cookie)
    {
        using var client = new HttpClient { BaseAddress = Http.BaseAddress };
        using var request = new HttpRequestMessage(HttpMethod.Get, path);
        request.Headers.Add("Cookie", "orchard_review=" + cookie);
        using var response = await client.SendAsync(request);
        return response.StatusCode;
    }

    public void Dispose()
    {
        Http.Dispose();
        handler.Dispose();
    }

    private async Task<HttpResponseMessage> PostFormAsync(string path, Dictionary<string, string> fields, string? origin, string? fetchSite)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, path) { Content = new FormUrlEncodedContent(fields) };
        if (origin is not null)
        {
            request.Headers.Add("Origin", origin.Length == 0 ? Origin : origin);
        }

        if (fetchSite is not null)
        {
            request.Headers.Add("Sec-Fetch-Site", fetchSite);
        }

        return await Http.SendAsync(request);
    }
}
