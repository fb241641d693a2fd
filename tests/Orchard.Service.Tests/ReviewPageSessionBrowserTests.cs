using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.Playwright;

namespace Orchard.Service.Tests;

/// <summary>
/// The review page in real headless Chromium, around its session: the page's own forms sign in and out
/// (with its antiforgery token); a tree scanned again is drawn from its new scan while the plan is on the
/// way; sign-out ends the session on the server (the old cookie no longer works); and the browser reports
/// no errors (no script error, nothing the page's Content-Security-Policy refused; 404s it expects aside).
/// </summary>
public sealed class ReviewPageSessionBrowserTests
{
    [Fact]
    public async Task A_rescanned_tree_draws_while_planning_and_sign_out_ends_the_session_on_the_server()
    {
        await using var service = await ServiceUnderTest.StartAsync(workers: 0);
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

        using var playwright = await Playwright.CreateAsync();
        await using var browser = await Chromium.LaunchAsync(playwright);
        var page = await browser.NewPageAsync();
        var problems = new List<string>();
        page.Console += (_, message) =>
        {
            // A 404 the page expects (the re-scanned tree's schedule, the favicon) is logged as a failed
            // load; anything else (a refusal by the Content-Security-Policy, a script error) is a problem.
            if (message.Type == "error" && !message.Text.Contains("status of 404", StringComparison.Ordinal))
            {
                problems.Add(message.Text);
            }
        };
        page.PageError += (_, error) => problems.Add(error);

        var root = service.Http.BaseAddress!.GetLeftPart(UriPartial.Authority);
        await page.GotoAsync(root + "/review/");
        await page.FillAsync("#key", service.Keys["manager"]);
        await page.ClickAsync("#sign-in button[type=submit]");
        await page.WaitForSelectorAsync("#rows tbody tr");

        // The tree is scanned again; no worker plans it yet. The page draws the new scan and says so.
        var tree = DemoScans.Tree(2, cuts: 3).TreeId;
        using (var rescan = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(2, cuts: 3)))))
        {
            Assert.Equal(HttpStatusCode.Accepted, rescan.StatusCode);
        }

        await page.ReloadAsync();
        await page.ClickAsync($"button[data-tree='{tree}']");
        await page.WaitForSelectorAsync("#front svg");
        Assert.Contains("Not planned yet", await page.InnerTextAsync("#tree-summary"), StringComparison.Ordinal);
        Assert.Equal(0, await page.Locator("#front .cut-mark").CountAsync());
        Assert.True(await page.Locator("#front line").CountAsync() > 3, "the new scan's branches are drawn");
        Assert.True(await page.Locator(".caution").IsVisibleAsync());

        // Sign-out with the page's own form ends the session on the server.
        var cookie = (await page.Context.CookiesAsync()).Single(c => c.Name == "orchard_review").Value;
        using var replay = new PageClient(service.Http.BaseAddress!);
        Assert.Equal(HttpStatusCode.OK, await replay.GetWithCookieAsync("/api/v1/trees", cookie));
        await page.ClickAsync("#back");
        await page.ClickAsync("#sign-out button[type=submit]");
        await page.WaitForSelectorAsync("#sign-in", new PageWaitForSelectorOptions { State = WaitForSelectorState.Visible });
        Assert.Equal(HttpStatusCode.Unauthorized, await replay.GetWithCookieAsync("/api/v1/trees", cookie));
        Assert.True(problems.Count == 0, "browser errors: " + string.Join(" | ", problems));
    }
}
