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
        await page.WaitForSelectorAsync("#rows tbody tr");
        // The overview lists it as waiting for the plan of its new scan (its old schedule is of another scan).
        Assert.Contains($"{tree} — scanned again", await page.InnerTextAsync("#queue"), StringComparison.Ordinal);
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

    /// <summary>
    /// One planned tree in a registered orchard of many: nothing to fit a time model on, so the ranges are
    /// absent (null) and every other tree is predicted from a fallback. The overview must still draw every
    /// table, the chart and the tree list, with no script error.
    /// </summary>
    [Fact]
    public async Task An_orchard_with_a_single_planned_tree_shows_its_overview_without_errors()
    {
        await using var service = await ServiceUnderTest.StartAsync(workers: 0);
        var registry = Orchard.Core.Demo.DemoOrchard.Generate(new Orchard.Core.Demo.DemoOrchardSettings(TreesPerRow: 2)).Registry();
        using (var rows = await service.Http.SendAsync(service.Request(HttpMethod.Put, "/api/v1/rows", "admin", ServiceUnderTest.Json(Orchard.Core.Serialization.OrchardJson.Serialize(registry)))))
        {
            Assert.Equal(HttpStatusCode.OK, rows.StatusCode);
        }

        string job;
        using (var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(0, cuts: 3)))))
        {
            job = (await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!;
        }

        await using (var worker = await ServiceUnderTest.StartWorkerOnAsync(service))
        {
            Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        }

        using var playwright = await Playwright.CreateAsync();
        await using var browser = await Chromium.LaunchAsync(playwright);
        var page = await browser.NewPageAsync();
        var problems = new List<string>();
        page.Console += (_, message) =>
        {
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
        await page.WaitForSelectorAsync("#chart svg rect");
        Assert.Equal(registry.Blocks.Sum(b => b.Rows.Count), await page.Locator("#rows tbody tr").CountAsync());
        Assert.Contains("1 of 1 scanned trees planned", await page.InnerTextAsync("#summary"), StringComparison.Ordinal);
        Assert.Contains("Nothing waiting", await page.InnerTextAsync("#queue"), StringComparison.Ordinal);
        var tree = DemoScans.Tree(0, cuts: 3).TreeId;
        await page.ClickAsync($"button[data-tree='{tree}']");
        await page.WaitForSelectorAsync("#front svg");
        Assert.Contains("Schedule version 1", await page.InnerTextAsync("#tree-summary"), StringComparison.Ordinal);
        Assert.True(problems.Count == 0, "browser errors: " + string.Join(" | ", problems));
    }
}
