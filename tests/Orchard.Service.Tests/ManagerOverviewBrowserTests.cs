using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using System.Text.RegularExpressions;
using Microsoft.Playwright;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;

namespace Orchard.Service.Tests;

/// <summary>
/// The manager's overview in a real headless Chromium (Debian's /usr/bin/chromium through Playwright; no
/// browser is downloaded), on the whole demo orchard as <c>demo</c> makes it (its rows registered through
/// the API, every tree planned through the queue): the README's screenshots, a block filter, hectares and
/// acres, the hand follow-up rate changing the person-hours, progress after outcomes posted through the API,
/// and the print view. With <c>ORCHARD_UPDATE_DOCS=1</c> the screenshots are also written to docs/.
/// </summary>
public sealed partial class ManagerOverviewBrowserTests
{
    private const string ChromiumPath = "/usr/bin/chromium";

    /// <summary>One international acre in hectares (4046.8564224 m², exact by definition of the international yard).</summary>
    private const double HectaresPerAcre = 0.40468564224;

    [Fact]
    public async Task A_manager_filters_by_block_switches_units_changes_the_hand_rate_sees_progress_and_prints()
    {
        Assert.True(File.Exists(ChromiumPath), $"{ChromiumPath} is missing: install Debian's chromium (deploy/ensure-packages.sh chromium).");
        await using var service = await ServiceUnderTest.StartAsync(workers: 2);
        var orchard = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 4));
        await SeedAsDemoAsync(service, orchard);

        // The page runs no inline script and no inline style (a Content-Security-Policy without 'unsafe-inline' holds).
        var html = await service.Http.GetStringAsync(new Uri("/review/", UriKind.Relative));
        Assert.DoesNotMatch(InlineScript(), html);
        Assert.DoesNotMatch(InlineHandlerOrStyle(), html);

        using var playwright = await Playwright.CreateAsync();
        await using var browser = await playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
        {
            ExecutablePath = ChromiumPath,
            Headless = true,
            Args = ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
        });
        var page = await browser.NewPageAsync(new BrowserNewPageOptions { ViewportSize = new ViewportSize { Width = 1400, Height = 1000 } });
        var errors = new List<string>();
        page.PageError += (_, e) => errors.Add(e);
        var screenshots = Path.Combine(AppContext.BaseDirectory, "TestResults", "screenshots");
        Directory.CreateDirectory(screenshots);

        await page.GotoAsync(service.Http.BaseAddress + "review/");
        await page.FillAsync("#key", service.Keys["manager"]);
        await page.ClickAsync("#sign-in button[type=submit]");
        await page.WaitForSelectorAsync("#rows tbody tr");
        Assert.Equal(orchard.Rows.Count, await page.Locator("#rows tbody tr").CountAsync());
        Assert.True(await page.Locator(".caution").IsVisibleAsync());
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(screenshots, "review-rows.png"), FullPage = true });

        // The README's tree picture: the first demo tree.
        await page.ClickAsync($"button[data-tree='{orchard.Trees[0].Scan.TreeId}']");
        await page.WaitForSelectorAsync("#front svg");
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(screenshots, "review-tree.png"), FullPage = true });
        await page.ClickAsync("#back");
        await page.WaitForSelectorAsync("#overview:not([hidden])");
        PublishScreenshots(screenshots);

        // Block filter: only that block's rows, its own totals.
        var block = orchard.Rows[^1].Block;
        await page.SelectOptionAsync("#block-filter", block);
        var blockRows = orchard.Rows.Where(r => r.Block == block).Select(r => r.Name).ToList();
        Assert.Equal(blockRows.Order(StringComparer.Ordinal), (await page.Locator("#rows tbody tr").EvaluateAllAsync<string[]>("rows => rows.map(r => r.dataset.row)")).Order(StringComparer.Ordinal));
        Assert.Equal(1, await page.Locator("#blocks tbody tr").CountAsync());
        Assert.StartsWith($"Block {block}:", await page.InnerTextAsync("#summary"), StringComparison.Ordinal);

        // Units: the area and hours per area of a row, in hectares and then in acres, as the API gives them in hectares.
        var row = Row(await EstimatesAsync(service), blockRows[0]);
        var rowLocator = page.Locator($"#rows tbody tr[data-row='{blockRows[0]}']");
        Assert.Equal(Fixed(row.GetProperty("areaHa").GetDouble(), 2), await rowLocator.Locator("td.area").InnerTextAsync());
        await page.SelectOptionAsync("#units", "ac");
        Assert.Equal("Area (ac)", await page.InnerTextAsync("#rows th button[data-sort=area]"));
        Assert.Equal(Fixed(row.GetProperty("areaHa").GetDouble() / HectaresPerAcre, 2), await rowLocator.Locator("td.area").InnerTextAsync());
        Assert.Equal(Fixed(row.GetProperty("hoursPerHectare").GetDouble() * HectaresPerAcre, 1), await rowLocator.Locator("td.per-area").InnerTextAsync());
        Assert.Contains("Hours per acre", await page.InnerTextAsync("#rows thead"), StringComparison.Ordinal);

        // The hand rate per cut: doubling it doubles the row's hand follow-up person-hours, and the orchard keeps it.
        var handBefore = row.GetProperty("handPersonHours").GetDouble();
        Assert.True(handBefore > 0, "the demo leaves cuts for the hand crew");
        var rate = double.Parse(await page.InputValueAsync("#rate-hand"), CultureInfo.InvariantCulture);
        await page.FillAsync("#rate-hand", (2 * rate).ToString(CultureInfo.InvariantCulture));
        await page.ClickAsync("#rates button[type=submit]");
        await page.WaitForFunctionAsync("() => document.getElementById('rates-status').textContent.startsWith('Saved')");
        var after = await EstimatesAsync(service);
        Assert.Equal(2 * rate, after.GetProperty("handSecondsPerCut").GetDouble());
        // Saved through the page's own form (its session cookie makes no API writes), audited as the session's key.
        using (var audit = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/audit?limit=20", "admin")))
        {
            Assert.Contains((await audit.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray(),
                a => a.GetProperty("action").GetString() == "orchardDocument.put" && a.GetProperty("target").GetString() == "rates" && a.GetProperty("keyId").GetString() is { Length: > 0 });
        }

        var handAfter = Row(after, blockRows[0]).GetProperty("handPersonHours").GetDouble();
        Assert.Equal(2 * handBefore, handAfter, 1e-9);
        Assert.Equal(Fixed(handAfter, 2), await rowLocator.Locator("td.hand").InnerTextAsync());
        Assert.NotEqual(Fixed(handBefore, 2), Fixed(handAfter, 2));

        // A rate out of range is refused by field, and nothing changes.
        await page.FillAsync("#rate-speed", "-3");
        await page.ClickAsync("#rates button[type=submit]");
        await page.WaitForSelectorAsync("#rate-speed[aria-invalid=true]");
        Assert.Contains("platform speed", await page.InnerTextAsync("#rates-status"), StringComparison.OrdinalIgnoreCase);
        Assert.Equal(EstimatesDefaultsSpeed, (await EstimatesAsync(service)).GetProperty("platformSpeedKmh").GetDouble());

        // Progress: two cuts done and one missed on a tree of the row, through the API; the re-plan is counted once written.
        var replanJob = await ReportOutcomesAsync(service, orchard.Trees.Where(t => t.Row.Name == blockRows[0]).Select(t => t.Scan.TreeId));
        Assert.Equal("done", (await service.WaitForJobAsync(replanJob, TimeSpan.FromSeconds(120))).GetProperty("status").GetString());
        await page.ClickAsync("#refresh");
        await page.WaitForFunctionAsync($"() => document.querySelector(\"#rows tbody tr[data-row='{blockRows[0]}'] td.replans\")?.textContent === '1'");
        Assert.Equal(("2", "1", "1"), (await rowLocator.Locator("td.done").InnerTextAsync(), await rowLocator.Locator("td.missed").InnerTextAsync(), await rowLocator.Locator("td.replans").InnerTextAsync()));
        Assert.Equal("2", await page.Locator($"#blocks tbody tr[data-block='{block}'] td.done").InnerTextAsync());

        // Print: the figures and the safety note, no controls and no tree view.
        await page.EmulateMediaAsync(new PageEmulateMediaOptions { Media = Media.Print });
        Assert.False(await page.Locator("#controls").IsVisibleAsync());
        Assert.False(await page.Locator("#rates").IsVisibleAsync());
        Assert.False(await page.Locator("#trees").IsVisibleAsync());
        Assert.True(await page.Locator("#rows").IsVisibleAsync());
        Assert.True(await page.Locator("#blocks").IsVisibleAsync());
        Assert.True(await page.Locator(".caution").IsVisibleAsync());
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(screenshots, "review-print.png"), FullPage = true });
        await page.EmulateMediaAsync(new PageEmulateMediaOptions { Media = Media.Screen });
        Assert.True(await page.Locator("#controls").IsVisibleAsync());
        Assert.Empty(errors);
    }

    private const double EstimatesDefaultsSpeed = 0.5;

    /// <summary>What <c>demo</c> does: the rows through the API as an admin, then every tree as the tablet, planned through the queue.</summary>
    private static async Task SeedAsDemoAsync(ServiceUnderTest service, DemoOrchard orchard)
    {
        using (var rows = await service.Http.SendAsync(service.Request(HttpMethod.Put, "/api/v1/rows", "admin", ServiceUnderTest.Json(OrchardJson.Serialize(orchard.Registry())))))
        {
            Assert.Equal(HttpStatusCode.OK, rows.StatusCode);
        }

        var jobs = new List<string>();
        foreach (var tree in orchard.Trees)
        {
            using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(OrchardJson.Serialize(tree.Scan))));
            Assert.Equal(HttpStatusCode.Accepted, post.StatusCode);
            jobs.Add((await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!);
        }

        foreach (var job in jobs)
        {
            Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromMinutes(5))).GetProperty("status").GetString());
        }
    }

    /// <summary>On the first of <paramref name="trees"/> with three scheduled cuts: two done, the third missed; returns the re-plan job.</summary>
    private static async Task<string> ReportOutcomesAsync(ServiceUnderTest service, IEnumerable<string> trees)
    {
        string? tree = null;
        List<JsonElement> steps = [];
        foreach (var candidate in trees)
        {
            using var get = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{candidate}/schedule", "controller"));
            var schedule = await get.Content.ReadFromJsonAsync<JsonElement>();
            steps = schedule.GetProperty("stops").EnumerateArray().SelectMany(s => s.GetProperty("steps").EnumerateArray()).ToList();
            if (steps.Count >= 3)
            {
                tree = candidate;
                break;
            }
        }

        Assert.True(tree is not null, "a demo tree of the row has three scheduled cuts to report");
        foreach (var step in steps.Take(2))
        {
            using var done = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
                JsonContent.Create(new { version = 1, cutId = step.GetProperty("cutId").GetString(), outcome = "done" })));
            Assert.Equal(HttpStatusCode.Accepted, done.StatusCode);
        }

        var here = steps[2].GetProperty("preCutConfiguration").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        using var missed = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version = 1, cutId = steps[2].GetProperty("cutId").GetString(), outcome = "missed", configuration = here })));
        Assert.Equal(HttpStatusCode.Accepted, missed.StatusCode);
        return (await missed.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("replanJobId").GetString()!;
    }

    private static async Task<JsonElement> EstimatesAsync(ServiceUnderTest service)
    {
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/estimates", "manager"));
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    private static JsonElement Row(JsonElement view, string row) =>
        view.GetProperty("rows").EnumerateArray().Single(r => r.GetProperty("row").GetString() == row);

    /// <summary>The page's number format (JavaScript's toFixed; the values here are not at a rounding tie).</summary>
    private static string Fixed(double value, int digits) => value.ToString("F" + digits, CultureInfo.InvariantCulture);

    /// <summary>docs/ holds the README's screenshots; they are replaced when ORCHARD_UPDATE_DOCS=1.</summary>
    private static void PublishScreenshots(string folder)
    {
        if (Environment.GetEnvironmentVariable("ORCHARD_UPDATE_DOCS") != "1")
        {
            return;
        }

        var root = new DirectoryInfo(AppContext.BaseDirectory);
        while (root is not null && !File.Exists(Path.Combine(root.FullName, "Orchard.sln")))
        {
            root = root.Parent;
        }

        foreach (var name in new[] { "review-rows.png", "review-tree.png" })
        {
            File.Copy(Path.Combine(folder, name), Path.Combine(root!.FullName, "docs", name), overwrite: true);
        }
    }

    [GeneratedRegex(@"<script(?![^>]*\bsrc=)[^>]*>", RegexOptions.IgnoreCase)]
    private static partial Regex InlineScript();

    [GeneratedRegex(@"\s(on[a-z]+|style)\s*=", RegexOptions.IgnoreCase)]
    private static partial Regex InlineHandlerOrStyle();
}
