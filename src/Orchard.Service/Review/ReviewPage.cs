using System.Globalization;
using System.Reflection;
using System.Security.Claims;
using Microsoft.AspNetCore.Antiforgery;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Authentication.Cookies;
using Orchard.Core.Estimates;
using Orchard.Core.Validation;
using Orchard.Service.Api;
using Orchard.Service.Application;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Review;

/// <summary>
/// The manager's review page: static files compiled into the executable (no CDN, nothing from the
/// internet), and a sign-in that turns a manager or admin key into a session cookie with the manager's
/// role. The cookie is honoured only on the GET endpoints the page reads, on sign-out and on the page's one
/// change, the orchard's reference rates (its own form endpoint, never the API's PUT); sign-in, sign-out and
/// the rates form need the page's antiforgery token and a request from the page's own origin.
/// </summary>
public static class ReviewPage
{
    /// <summary>The form field that carries the antiforgery token.</summary>
    public const string AntiforgeryField = "_af";

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
        app.MapPost("/review/sign-out", SignOutAsync).AllowAnonymous().DisableAntiforgery().ExcludeFromDescription();
        app.MapGet("/review/session", Session).AllowAnonymous().ExcludeFromDescription();
        app.MapPost("/review/rates", SaveRatesAsync).RequireAuthorization(p => p.RequireRole(Roles.Manager)).DisableAntiforgery().ExcludeFromDescription();
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

    /// <summary>Who is signed in, and the antiforgery token the page's forms send back (never cached).</summary>
    private static IResult Session(HttpContext context, ClaimsPrincipal user, IAntiforgery antiforgery)
    {
        var token = antiforgery.GetAndStoreTokens(context).RequestToken;
        context.Response.Headers.CacheControl = "no-store";
        return user.Identity?.IsAuthenticated == true
            ? Results.Ok(new { signedIn = true, role = user.FindFirstValue(ClaimTypes.Role), label = user.FindFirstValue(ClaimTypes.Name), antiforgery = token })
            : Results.Ok(new { signedIn = false, role = (string?)null, label = (string?)null, antiforgery = token });
    }

    /// <summary>Form post with a manager or admin key; a usable one opens a session (as manager either way).</summary>
    private static async Task<IResult> SignInAsync(HttpContext context, ApiKeyCache keys, IAntiforgery antiforgery, FailedAuthLimiter failures, SessionLifetime lifetime, TimeProvider clock)
    {
        if (await RefusedAsync(context, antiforgery) is { } refused)
        {
            return refused;
        }

        var form = await context.Request.ReadFormAsync(context.RequestAborted);
        var secret = form["key"].ToString();
        var now = clock.GetUtcNow();
        var key = string.IsNullOrWhiteSpace(secret) ? null : await keys.FindAsync(ApiKeySecrets.HashHex(secret), context.RequestAborted);
        if (key is null || !key.IsUsableAt(now) || key.Role is not (Roles.Manager or Roles.Admin))
        {
            failures.Failed(context);
            return Results.Redirect("/review/?signin=failed");
        }

        var expires = key.ExpiresAt is { } keyExpiry && keyExpiry < now + lifetime.Value ? keyExpiry : now + lifetime.Value;
        var identity = new ClaimsIdentity(
            [new Claim(ClaimTypes.NameIdentifier, key.KeyId), new Claim(ClaimTypes.Role, Roles.Manager), new Claim(ClaimTypes.Name, key.Label)],
            CookieAuthenticationDefaults.AuthenticationScheme);
        await context.SignInAsync(CookieAuthenticationDefaults.AuthenticationScheme, new ClaimsPrincipal(identity), new AuthenticationProperties { ExpiresUtc = expires, AllowRefresh = false });
        return Results.Redirect("/review/");
    }

    /// <summary>Ends the session on the server (its id is revoked in the store) and drops the cookie.</summary>
    private static async Task<IResult> SignOutAsync(HttpContext context, IAntiforgery antiforgery, IOrchardStore store)
    {
        if (await RefusedAsync(context, antiforgery) is { } refused)
        {
            return refused;
        }

        var session = context.User.FindFirstValue(SessionTicketStore.SessionClaim);
        await context.SignOutAsync(CookieAuthenticationDefaults.AuthenticationScheme);
        if (session is not null)
        {
            await store.RevokeSessionAsync(session, context.RequestAborted);
        }

        return Results.Redirect("/review/");
    }

    /// <summary>
    /// The page's rates form (a manager's session): the rates given are kept for the orchard as with
    /// <c>PUT /api/v1/rates</c>, audited as the session's key; 200 with every rate, or a problem naming each
    /// bad field by the rates document's JSON path (<c>$.handSecondsPerCut</c>).
    /// </summary>
    private static async Task<IResult> SaveRatesAsync(HttpContext context, ClaimsPrincipal user, IAntiforgery antiforgery, OrchardSetup setup)
    {
        if (await RefusedAsync(context, antiforgery) is { } refused)
        {
            return refused;
        }

        var form = await context.Request.ReadFormAsync(context.RequestAborted);
        var problems = new List<ValidationProblem>();
        var rates = new ReferenceRates(
            Number(form, "manualSecondsPerTree", problems),
            Number(form, "platformSpeedKmh", problems),
            Number(form, "handSecondsPerCut", problems));
        return problems.Count > 0
            ? Problems.Invalid(400, "The reference rates are not readable", problems)
            : Answers.From(await setup.SaveRatesAsync(rates, Caller.Of(user), context.RequestAborted));
    }

    /// <summary>A form field as a number (invariant culture); empty or absent keeps the stored rate.</summary>
    private static double? Number(IFormCollection form, string name, List<ValidationProblem> problems)
    {
        var text = form[name].ToString().Trim();
        if (text.Length == 0)
        {
            return null;
        }

        if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) && double.IsFinite(value))
        {
            return value;
        }

        problems.Add(ValidationProblem.Error("$." + name, "json.type", $"Expected a number; found '{(text.Length <= 40 ? text : text[..37] + "…")}'."));
        return null;
    }

    private static async Task<IResult?> RefusedAsync(HttpContext context, IAntiforgery antiforgery)
    {
        if (!PageRequests.FromThisOrigin(context.Request))
        {
            return Problems.Of(403, "Not from this page", "Sign-in, sign-out and the rates form are accepted only from the review page itself (Origin and Sec-Fetch-Site must name this origin).", "$header.Origin", "origin.foreign");
        }

        if (!context.Request.HasFormContentType)
        {
            return Problems.Of(415, "A form is expected", "Send the page's form (application/x-www-form-urlencoded).", "$header.Content-Type", "contentType.form");
        }

        if (!await antiforgery.IsRequestValidAsync(context))
        {
            return Problems.Of(400, "Missing or stale page token", "Reload the review page and try again.", "$form." + AntiforgeryField, "antiforgery.invalid");
        }

        return null;
    }
}
