using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.Playwright;

namespace Orchard.Service.Tests;

/// <summary>
/// The review page in a real headless Chromium (Debian's /usr/bin/chromium, driven by Playwright; no
/// browser is downloaded): sign in, every row with its hours, sorting, a tree's drawing with one
/// numbered mark per scheduled cut, and the safety cautions. Screenshots go to TestResults/screenshots.
/// </summary>
public sealed class ReviewPageBrowserTests
{
    private const string ChromiumPath = "/usr/bin/chromium";

    [Fact]
    public async Task A_manager_signs_in_sees_the_rows_sorts_them_and_opens_a_tree()
    {
        await EnsureChromiumAsync();
        Assert.True(File.Exists(ChromiumPath), $"{ChromiumPath} is missing: install Debian's chromium (deploy/ensure-packages.sh chromium).");
        await using var service = await ServiceUnderTest.StartAsync();

        // The first tree of every demo row (two trees of the first row), planned through the real queue.
        var posted = new[] { 0, 1, 2, 4, 6, 8, 10 };
        var jobs = new List<string>();
        foreach (var index in posted)
        {
            using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(index, cuts: 6))));
            jobs.Add((await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!);
        }

        foreach (var job in jobs)
        {
            Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        }

        using var playwright = await Playwright.CreateAsync();
        await using var browser = await playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
        {
            ExecutablePath = ChromiumPath,
            Headless = true,
            Args = ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
        });
        var page = await browser.NewPageAsync(new BrowserNewPageOptions { ViewportSize = new ViewportSize { Width = 1280, Height = 1000 } });
        var screenshots = Path.Combine(AppContext.BaseDirectory, "TestResults", "screenshots");
        Directory.CreateDirectory(screenshots);

        await page.GotoAsync(service.Http.BaseAddress + "review/");
        Assert.True(await page.Locator(".caution").IsVisibleAsync(), "the safety cautions are visible before sign-in");
        await page.FillAsync("#key", service.Keys["manager"]);
        await page.ClickAsync("#sign-in button[type=submit]");
        await page.WaitForSelectorAsync("#rows tbody tr");
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(screenshots, "review-rows.png"), FullPage = true });

        // Every demo row posted is there with its hours.
        var rowNames = DemoScans.Names(posted);
        Assert.Equal(6, rowNames.Distinct().Count());
        var cells = await page.Locator("#rows tbody tr").AllInnerTextsAsync();
        Assert.Equal(rowNames.Distinct().Count(), cells.Count);
        foreach (var row in rowNames.Distinct())
        {
            Assert.Contains(cells, c => c.Contains(row, StringComparison.Ordinal));
        }

        Assert.All(cells, c => Assert.Matches(@"\d+\.\d\d", c));
        Assert.True(await page.Locator(".caution").IsVisibleAsync());

        // Sorting by arm hours, both ways, by keyboard.
        await page.FocusAsync("button[data-sort=hours]");
        await page.Keyboard.PressAsync("Enter");
        Assert.Equal("ascending", await page.GetAttributeAsync("th:has(button[data-sort=hours])", "aria-sort"));
        var ascending = await HoursAsync(page);
        Assert.Equal(ascending.Order().ToList(), ascending);
        await page.Keyboard.PressAsync("Enter");
        var descending = await HoursAsync(page);
        Assert.Equal(ascending.OrderDescending().ToList(), descending);

        // A tree: one numbered mark per scheduled cut in each drawing.
        var tree = DemoScans.Tree(0, cuts: 6).TreeId;
        using var scheduleResponse = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{tree}/schedule", "manager"));
        var schedule = await scheduleResponse.Content.ReadFromJsonAsync<JsonElement>();
        var stops = schedule.GetProperty("stops").GetArrayLength();
        var steps = schedule.GetProperty("stops").EnumerateArray().Sum(stop => stop.GetProperty("steps").GetArrayLength());
        var unreachable = schedule.GetProperty("unscheduled").EnumerateArray().Where(u => u.GetProperty("status").GetString() == "unreachable").Select(u => u.GetProperty("cutId").GetString()!).ToList();
        await page.ClickAsync($"button[data-tree='{tree}']");
        await page.WaitForSelectorAsync("#front svg");
        Assert.Equal(steps, await page.Locator("#front .cut-mark").CountAsync());
        Assert.DoesNotContain("NaN", await page.InnerHTMLAsync("#front"), StringComparison.Ordinal);
        Assert.Equal(steps, await page.Locator("#side .cut-mark").CountAsync());
        var numbers = await page.Locator("#front .cut-mark text").AllTextContentsAsync();
        Assert.Equal(Enumerable.Range(1, steps).Select(i => i.ToString(System.Globalization.CultureInfo.InvariantCulture)).Order(StringComparer.Ordinal), numbers.Order(StringComparer.Ordinal));
        // Every stop marked in both drawings; every unreachable cut marked with its id; no two labels on top of each other.
        Assert.Equal(stops, await page.Locator("#front .stop-mark").CountAsync());
        Assert.Equal(stops, await page.Locator("#side .stop-mark").CountAsync());
        var marks = await page.Locator("#front .cut-unreachable").AllTextContentsAsync();
        Assert.Equal(unreachable.Count, marks.Count);
        Assert.All(unreachable, id => Assert.Contains(marks, m => m.Contains(id, StringComparison.Ordinal)));
        foreach (var view in new[] { "#front", "#side" })
        {
            var boxes = new List<(double X, double Y, double W, double H)>();
            foreach (var label in await page.Locator($"{view} .cut-mark text, {view} .stop-label, {view} .unreachable-label").AllAsync())
            {
                var box = (await label.BoundingBoxAsync())!;
                boxes.Add((box.X, box.Y, box.Width, box.Height));
            }

            for (var a = 0; a < boxes.Count; a++)
            {
                for (var b = a + 1; b < boxes.Count; b++)
                {
                    var (p, q) = (boxes[a], boxes[b]);
                    var overlap = Math.Min(p.X + p.W, q.X + q.W) - Math.Max(p.X, q.X) > 0.5 && Math.Min(p.Y + p.H, q.Y + q.H) - Math.Max(p.Y, q.Y) > 0.5;
                    Assert.False(overlap, $"{view}: labels {a} and {b} overlap");
                }
            }
        }

        // The timeline: four phases per cut, approach and retract drawn apart, a return to stow per stop, a time axis.
        foreach (var phase in new[] { "travel", "approach", "cut", "retract" })
        {
            Assert.Equal(steps, await page.Locator($"#timeline rect.phase-{phase}").CountAsync());
        }

        Assert.NotEqual(await page.GetAttributeAsync("#timeline rect.phase-approach >> nth=0", "stroke-dasharray"), await page.GetAttributeAsync("#timeline rect.phase-retract >> nth=0", "stroke-dasharray"));
        Assert.Equal(stops, await page.Locator("#timeline rect.phase-return").CountAsync());
        Assert.Equal(1, await page.Locator("#timeline .time-axis").CountAsync());
        Assert.True(await page.Locator("#timeline .tick").CountAsync() >= 2);
        Assert.True(await page.Locator(".caution").IsVisibleAsync());
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(screenshots, "review-tree.png"), FullPage = true });
    }

    /// <summary>On a fresh machine the README's test command installs Debian's chromium itself (as root).</summary>
    private static async Task EnsureChromiumAsync()
    {
        if (File.Exists(ChromiumPath))
        {
            return;
        }

        var root = new DirectoryInfo(AppContext.BaseDirectory);
        while (root is not null && !File.Exists(Path.Combine(root.FullName, "Orchard.sln")))
        {
            root = root.Parent;
        }

        using var install = System.Diagnostics.Process.Start("bash", [Path.Combine(root!.FullName, "deploy", "ensure-packages.sh"), "chromium"]);
        await install!.WaitForExitAsync();
    }

    private static async Task<List<double>> HoursAsync(IPage page) =>
        (await page.Locator("#rows tbody tr td:nth-child(5)").AllInnerTextsAsync()).Select(t => double.Parse(t, System.Globalization.CultureInfo.InvariantCulture)).ToList();
}
