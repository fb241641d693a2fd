using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Http;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Playwright;

namespace Orchard.Service.Tests;

/// <summary>
/// In a real headless Chromium, an admin signs in to the review page; then a page on another origin of the
/// same host (another port of 127.0.0.1: the same site, so the browser sends the SameSite=Strict cookie)
/// tries a forged scan (a text/plain form, and no-cors fetches with a text/plain body and with no
/// Content-Type at all, the requests a page may send without asking first; and a JSON fetch, which must
/// ask first), a forged missed outcome (text/plain and untyped), a forged sign-in with the
/// attacker's own key and token (login forgery), a forged sign-out and a forged save of the orchard's rates
/// through the page's own rates form (and a JSON PUT of the rates, which must ask first). The browser sends every one of them;
/// none has any effect: nothing is stored, no session opens or ends, and the admin is still signed in.
/// </summary>
public sealed class CrossOriginForgeryBrowserTests
{
    [Fact]
    public async Task A_page_on_another_origin_of_the_same_host_cannot_scan_report_sign_in_sign_out_or_change_rates()
    {
        await using var service = await ServiceUnderTest.StartAsync(workers: 0);
        var tree = DemoScans.Tree(2, cuts: 3);
        // The first tree of each demo row, planned, so the overview has its rows to show.
        var jobs = new List<string>();
        foreach (var index in new[] { 0, 2, 4, 6, 8, 10 })
        {
            using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(index, cuts: 3))));
            jobs.Add((await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!);
        }

        await using (var worker = await ServiceUnderTest.StartWorkerOnAsync(service))
        {
            foreach (var job in jobs)
            {
                Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
            }
        }

        using var scheduleResponse = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{tree.TreeId}/schedule", "controller"));
        var step = (await scheduleResponse.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("stops")[0].GetProperty("steps")[0];
        using var attackerKey = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/api-keys", "admin", JsonContent.Create(new { role = "manager", label = "attacker" })));
        var attackerSecret = (await attackerKey.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("secret").GetString()!;

        var target = service.Http.BaseAddress!.GetLeftPart(UriPartial.Authority);
        // The attacker's own antiforgery pair, fetched by its server, to plant beside its forms.
        using var attackerSession = new PageClient(service.Http.BaseAddress!);
        var attackerToken = (await attackerSession.SessionAsync()).GetProperty("antiforgery").GetString()!;
        var plantedCookie = attackerSession.Jar.GetCookies(service.Http.BaseAddress!)["orchard_af"]!.Value;
        var outcome = JsonSerializer.Serialize(new { version = 1, cutId = step.GetProperty("cutId").GetString(), outcome = "missed", configuration = step.GetProperty("preCutConfiguration") });
        var html = AttackerPage(target, DemoScans.Json(4, cuts: 2), tree.TreeId, outcome, attackerSecret, attackerToken, plantedCookie);
        await using var attacker = await StartAttackerAsync(html);
        Assert.NotEqual(new Uri(attacker.Address).Port, service.Http.BaseAddress!.Port);

        using var playwright = await Playwright.CreateAsync();
        await using var browser = await Chromium.LaunchAsync(playwright);
        var page = await browser.NewPageAsync();
        var statuses = new List<(string Method, string Url, int Status)>();
        var sent = new List<(string Method, string Url)>();
        page.Context.Request += (_, request) =>
        {
            if (request.Url.StartsWith(target, StringComparison.Ordinal) && request.Method == "POST")
            {
                lock (sent)
                {
                    sent.Add((request.Method, request.Url[target.Length..]));
                }
            }
        };

        // Answers the browser let through to the page (a no-cors answer withheld by Cross-Origin-Resource-Policy shows no status).
        page.Context.Response += (_, response) =>
        {
            if (response.Url.StartsWith(target, StringComparison.Ordinal) && response.Request.Method != "GET")
            {
                lock (statuses)
                {
                    statuses.Add((response.Request.Method, response.Url[target.Length..], response.Status));
                }
            }
        };

        // The admin signs in on the page.
        await page.GotoAsync(target + "/review/");
        await page.FillAsync("#key", service.Keys["admin"]);
        await page.ClickAsync("#sign-in button[type=submit]");
        await page.WaitForSelectorAsync("#rows tbody tr");
        Assert.Contains(statuses, s => s is { Method: "POST", Url: "/review/sign-in", Status: 302 });
        lock (statuses)
        {
            statuses.Clear();
        }

        lock (sent)
        {
            sent.Clear();
        }

        var before = await service.Store.CountRowsAsync(CancellationToken.None);

        // The other origin's page does its worst, then says it is done.
        await page.GotoAsync(attacker.Address);
        await page.WaitForFunctionAsync("document.title === 'done'", null, new PageWaitForFunctionOptions { Timeout = 30_000 });
        await page.WaitForTimeoutAsync(500);

        // The browser sent every forged request, and each answer it saw was a refusal.
        List<(string Method, string Url)> posted;
        List<(string Method, string Url, int Status)> seen;
        lock (sent)
        {
            posted = sent.ToList();
        }

        lock (statuses)
        {
            seen = statuses.ToList();
        }

        var report = "sent: " + string.Join(", ", posted) + "; answers seen: " + string.Join(", ", seen);
        Assert.True(posted.Count(p => p.Url == "/api/v1/scans") >= 3, report);
        Assert.True(posted.Count(p => p.Url == $"/api/v1/trees/{tree.TreeId}/outcomes") >= 2, report);
        Assert.Contains(("POST", "/review/sign-in"), posted);
        Assert.Contains(("POST", "/review/sign-out"), posted);
        Assert.Contains(("POST", "/review/rates"), posted);
        Assert.Contains(seen, s => s is { Url: "/review/rates", Status: 403 });
        Assert.Contains(seen, s => s is { Url: "/review/sign-in", Status: 403 });
        Assert.Contains(seen, s => s is { Url: "/review/sign-out", Status: 403 });
        Assert.All(seen, s => Assert.True(s.Status is >= 400 and < 500, report));

        // Nothing was stored, no session opened or ended, and the admin is still signed in as before.
        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));
        await page.GotoAsync(target + "/review/session");
        var session = JsonDocument.Parse(await page.InnerTextAsync("body")).RootElement;
        Assert.True(session.GetProperty("signedIn").GetBoolean(), "still signed in");
        Assert.Equal("bootstrap admin", session.GetProperty("label").GetString());
        using var trees = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager"));
        Assert.Equal(6, (await trees.Content.ReadFromJsonAsync<JsonElement>()).GetArrayLength());
    }

    private static string AttackerPage(string target, string scanJson, string treeId, string outcomeJson, string attackerKey, string attackerToken, string plantedCookie)
    {
        static string Js(string text) => JsonSerializer.Serialize(text);
        static string Attr(string text) => WebUtility.HtmlEncode(text);
        // A text/plain form whose body reads as JSON: name '{"...":"' and value '"}'.
        var split = scanJson.Length - 2;
        return $$"""
            <!doctype html>
            <html><head><meta charset="utf-8"><title>prize</title></head>
            <body>
            <iframe name="sink1"></iframe><iframe name="sink2"></iframe><iframe name="sink3"></iframe><iframe name="sink4"></iframe>
            <form id="scan" method="post" action="{{target}}/api/v1/scans" enctype="text/plain" target="sink1">
              <input type="hidden" name="{{Attr(scanJson[..split] + ",\"x\":\"")}}" value="{{Attr("\"}")}}">
            </form>
            <form id="signin" method="post" action="{{target}}/review/sign-in" target="sink2">
              <input type="hidden" name="key" value="{{Attr(attackerKey)}}">
              <input type="hidden" name="_af" value="{{Attr(attackerToken)}}">
            </form>
            <form id="signout" method="post" action="{{target}}/review/sign-out" target="sink3">
              <input type="hidden" name="_af" value="{{Attr(attackerToken)}}">
            </form>
            <form id="rates" method="post" action="{{target}}/review/rates" target="sink4">
              <input type="hidden" name="handSecondsPerCut" value="1">
              <input type="hidden" name="_af" value="{{Attr(attackerToken)}}">
            </form>
            <script>
              (async () => {
                const target = {{Js(target)}};
                const opts = (body, type) => ({ method: "POST", credentials: "include", mode: "no-cors", headers: { "Content-Type": type }, body });
                try { document.cookie = "orchard_af=" + {{Js(plantedCookie)}} + "; path=/"; } catch (e) {}
                document.getElementById("scan").submit();
                await fetch(target + "/api/v1/scans", opts({{Js(scanJson)}}, "text/plain")).catch(() => {});
                // A body with no Content-Type at all (a Blob without a type).
                await fetch(target + "/api/v1/scans", { method: "POST", credentials: "include", mode: "no-cors", body: new Blob([{{Js(scanJson)}}]) }).catch(() => {});
                await fetch(target + "/api/v1/scans", { method: "POST", credentials: "include", headers: { "Content-Type": "application/json" }, body: {{Js(scanJson)}} }).catch(() => {});
                await fetch(target + "/api/v1/trees/{{treeId}}/outcomes", opts({{Js(outcomeJson)}}, "text/plain")).catch(() => {});
                await fetch(target + "/api/v1/trees/{{treeId}}/outcomes", { method: "POST", credentials: "include", mode: "no-cors", body: new Blob([{{Js(outcomeJson)}}]) }).catch(() => {});
                await fetch(target + "/api/v1/rates", { method: "PUT", credentials: "include", headers: { "Content-Type": "application/json" }, body: '{"handSecondsPerCut":1}' }).catch(() => {});
                document.getElementById("rates").submit();
                await new Promise((r) => setTimeout(r, 300));
                document.getElementById("signin").submit();
                await new Promise((r) => setTimeout(r, 500));
                document.getElementById("signout").submit();
                await new Promise((r) => setTimeout(r, 800));
                document.title = "done";
              })();
            </script>
            </body></html>
            """;
    }

    /// <summary>The attacker's server: one page, on a loopback port of its own.</summary>
    private static async Task<AttackerSite> StartAttackerAsync(string html)
    {
        var app = WebApplication.CreateSlimBuilder(["--urls", "http://127.0.0.1:0"]).Build();
        app.MapGet("/", () => Results.Content(html, "text/html; charset=utf-8"));
        await app.StartAsync();
        return new AttackerSite(app, app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First() + "/");
    }

    private sealed class AttackerSite(WebApplication app, string address) : IAsyncDisposable
    {
        public string Address { get; } = address;

        public static implicit operator string(AttackerSite site) => site.Address;

        public async ValueTask DisposeAsync()
        {
            await app.StopAsync();
            await app.DisposeAsync();
        }
    }
}
