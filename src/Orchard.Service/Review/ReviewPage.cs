using System.Reflection;
using System.Security.Claims;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Authentication.Cookies;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Review;

/// <summary>
/// The manager's review page: static files compiled into the executable (no CDN, nothing from the
/// internet), and a sign-in that turns a manager key into a session cookie.
/// </summary>
public static class ReviewPage
{
    private static readonly Dictionary<string, string> Files = new(StringComparer.Ordinal)
    {
        ["index.html"] = "text/html; charset=utf-8",
        ["app.js"] = "text/javascript; charset=utf-8",
        ["overview.js"] = "text/javascript; charset=utf-8",
        ["style.css"] = "text/css; charset=utf-8",
    };

    public static void MapReview(this WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        app.MapGet("/", () => Results.Redirect("/review/")).AllowAnonymous().ExcludeFromDescription();
        app.MapGet("/review/{file?}", (string? file) => Serve(file ?? "index.html")).AllowAnonymous().ExcludeFromDescription();
        app.MapPost("/review/sign-in", SignInAsync).AllowAnonymous().DisableAntiforgery().ExcludeFromDescription();
        app.MapPost("/review/sign-out", async (HttpContext context) =>
        {
            await context.SignOutAsync(CookieAuthenticationDefaults.AuthenticationScheme);
            return Results.Redirect("/review/");
        }).AllowAnonymous().DisableAntiforgery().ExcludeFromDescription();
        app.MapGet("/review/session", (ClaimsPrincipal user) =>
            user.Identity?.IsAuthenticated == true
                ? Results.Ok(new { signedIn = true, role = user.FindFirstValue(ClaimTypes.Role), label = user.FindFirstValue(ClaimTypes.Name) })
                : Results.Ok(new { signedIn = false, role = (string?)null, label = (string?)null }))
            .AllowAnonymous().ExcludeFromDescription();
    }

    private static IResult Serve(string file)
    {
        if (!Files.TryGetValue(file, out var contentType))
        {
            return Results.Problem(title: "Not Found", detail: $"No review file '{file}'.", statusCode: 404);
        }

        var stream = Assembly.GetExecutingAssembly().GetManifestResourceStream($"Orchard.Service.Review.wwwroot.{file}");
        return stream is null ? Results.Problem(title: "Not Found", statusCode: 404) : Results.Stream(stream, contentType);
    }

    /// <summary>Form post with the manager's key; a good manager or admin key gets a session cookie.</summary>
    private static async Task<IResult> SignInAsync(HttpContext context, IOrchardStore store)
    {
        var form = await context.Request.ReadFormAsync(context.RequestAborted);
        var secret = form["key"].ToString();
        var key = string.IsNullOrWhiteSpace(secret) ? null : await store.FindApiKeyAsync(ApiKeySecrets.HashHex(secret), context.RequestAborted);
        if (key is null || key.Role is not (Roles.Manager or Roles.Admin))
        {
            return Results.Redirect("/review/?signin=failed");
        }

        var identity = new ClaimsIdentity(
            [new Claim(ClaimTypes.NameIdentifier, key.KeyId), new Claim(ClaimTypes.Role, key.Role), new Claim(ClaimTypes.Name, key.Label)],
            CookieAuthenticationDefaults.AuthenticationScheme);
        await context.SignInAsync(CookieAuthenticationDefaults.AuthenticationScheme, new ClaimsPrincipal(identity));
        return Results.Redirect("/review/");
    }
}
