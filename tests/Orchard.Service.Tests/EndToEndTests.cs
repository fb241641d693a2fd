using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>
/// The whole field loop over real HTTP on a loopback port: a tablet posts a demo scan, the worker plans
/// it, the controller fetches the schedule, reports cuts done and one missed, and gets the re-planned
/// version; retried POSTs do nothing twice; a stale version is refused.
/// </summary>
public abstract class EndToEndTests
{
    private static readonly string[] IntakeTables = ["scans", "jobs", "trees", "idempotency", "outcomes"];

    protected abstract Task<ServiceUnderTest> StartAsync();

    [Fact]
    public async Task A_scan_becomes_a_schedule_and_a_missed_cut_a_new_version()
    {
        await using var service = await StartAsync();
        var body = DemoScans.Json(2);
        var tree = DemoScans.Tree(2).TreeId;

        // Tablet posts; the retry with the same key gets the same answer and creates nothing.
        using var first = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(body), "scan-a"));
        Assert.Equal(HttpStatusCode.Accepted, first.StatusCode);
        var accepted = await first.Content.ReadFromJsonAsync<JsonElement>();
        var jobId = accepted.GetProperty("jobId").GetString()!;
        Assert.Equal($"/api/v1/jobs/{jobId}", first.Headers.Location!.ToString());
        // The worker may write the schedule meanwhile; what a POST could duplicate is scans, jobs, trees and answers.
        static async Task<string> Intake(ServiceUnderTest s)
        {
            var rows = await s.Store.CountRowsAsync(CancellationToken.None);
            return string.Join(",", IntakeTables.Select(t => $"{t}={rows.GetValueOrDefault(t)}"));
        }

        var rowsAfterFirst = await Intake(service);

        using var retry = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(body), "scan-a"));
        Assert.Equal(HttpStatusCode.Accepted, retry.StatusCode);
        Assert.Equal(jobId, (await retry.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString());
        Assert.Equal(rowsAfterFirst, await Intake(service));

        using var otherBody = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(3)), "scan-a"));
        Assert.Equal(HttpStatusCode.UnprocessableEntity, otherBody.StatusCode);
        Assert.Equal("application/problem+json", otherBody.Content.Headers.ContentType!.MediaType);

        // The worker plans it.
        var job = await service.WaitForJobAsync(jobId, TimeSpan.FromSeconds(90));
        Assert.Equal("done", job.GetProperty("status").GetString());

        // The controller reads the schedule; the ETag is its version.
        using var get = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{tree}/schedule", "controller"));
        Assert.Equal(HttpStatusCode.OK, get.StatusCode);
        Assert.Equal("\"v1\"", get.Headers.ETag!.Tag);
        var schedule = await get.Content.ReadFromJsonAsync<JsonElement>();
        var steps = schedule.GetProperty("stops").EnumerateArray().SelectMany(stop => stop.GetProperty("steps").EnumerateArray()).ToList();
        Assert.True(steps.Count >= 3, "the demo tree has several reachable cuts");

        var notModified = service.Request(HttpMethod.Get, $"/api/v1/trees/{tree}/schedule", "controller");
        notModified.Headers.TryAddWithoutValidation("If-None-Match", "\"v1\"");
        using var cached = await service.Http.SendAsync(notModified);
        Assert.Equal(HttpStatusCode.NotModified, cached.StatusCode);

        // Two cuts done, the third missed (retried last by the tree's default policy).
        var done = steps.Take(2).Select(s => s.GetProperty("cutId").GetString()!).ToArray();
        foreach (var (cut, i) in done.Select((c, i) => (c, i)))
        {
            using var ok = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
                JsonContent.Create(new { version = 1, cutId = cut, outcome = "done" }), $"outcome-{i}"));
            Assert.Equal(HttpStatusCode.Accepted, ok.StatusCode);
        }

        var missed = steps[2].GetProperty("cutId").GetString()!;
        var here = steps[2].GetProperty("preCutConfiguration").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        using var miss = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version = 1, cutId = missed, outcome = "missed", configuration = here }), "outcome-miss"));
        Assert.Equal(HttpStatusCode.Accepted, miss.StatusCode);
        var replanJob = (await miss.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("replanJobId").GetString()!;

        // Retrying the same outcome post does nothing twice.
        var rowsBefore = await Intake(service);
        using var missAgain = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version = 1, cutId = missed, outcome = "missed", configuration = here }), "outcome-miss"));
        Assert.Equal(HttpStatusCode.Accepted, missAgain.StatusCode);
        Assert.Equal(rowsBefore, await Intake(service));

        Assert.Equal("done", (await service.WaitForJobAsync(replanJob, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        using var second = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{tree}/schedule", "controller"));
        Assert.Equal("\"v2\"", second.Headers.ETag!.Tag);
        var replanned = await second.Content.ReadFromJsonAsync<JsonElement>();
        var next = replanned.GetProperty("stops").EnumerateArray().SelectMany(stop => stop.GetProperty("steps").EnumerateArray()).Select(s => s.GetProperty("cutId").GetString()!).ToList();
        Assert.DoesNotContain(next, done.Contains);
        // Retry last: the missed cut is the last one made from the stop where it was missed, before the platform moves on.
        var firstStop = replanned.GetProperty("stops")[0].GetProperty("steps").EnumerateArray().Select(s => s.GetProperty("cutId").GetString()!).ToList();
        Assert.Equal(missed, firstStop[^1]);
        Assert.Equal(here, replanned.GetProperty("stops")[0].GetProperty("startConfiguration").EnumerateArray().Select(v => v.GetDouble()).ToArray());

        // An outcome against the old version is refused with the current one.
        using var stale = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version = 1, cutId = next[0], outcome = "done" })));
        Assert.Equal(HttpStatusCode.Conflict, stale.StatusCode);
        Assert.Equal(2, (await stale.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("currentVersion").GetInt32());

        // The manager's estimates: the planned tree summed, the rest of its row predicted, as JSON and CSV.
        using var estimates = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/estimates", "manager"));
        var view = await estimates.Content.ReadFromJsonAsync<JsonElement>();
        var row = view.GetProperty("rows").EnumerateArray().Single();
        Assert.Equal(1, row.GetProperty("plannedTrees").GetInt32());
        Assert.True(row.GetProperty("totalHours").GetDouble() >= row.GetProperty("plannedHours").GetDouble());
        using var csv = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/estimates.csv", "manager"));
        Assert.Equal("text/csv", csv.Content.Headers.ContentType!.MediaType);
        Assert.True((await csv.Content.ReadAsStringAsync()).Split('\n', StringSplitOptions.RemoveEmptyEntries).Length >= 3, "header, the row, its block and the total");

        // The manager sees the tree's totals.
        using var trees = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager"));
        var listed = (await trees.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray().Single();
        Assert.Equal(2, listed.GetProperty("scheduleVersion").GetInt32());
        Assert.True(listed.GetProperty("totalSeconds").GetDouble() > 0);
    }
}

/// <summary>The field loop on the embedded SQLite store.</summary>
public sealed class SqliteEndToEndTests : EndToEndTests
{
    protected override Task<ServiceUnderTest> StartAsync() => ServiceUnderTest.StartAsync();
}

/// <summary>The field loop on PostgreSQL (a fresh database on the throwaway server of deploy/local-postgres.sh).</summary>
public sealed class PostgresEndToEndTests(Orchard.Store.Tests.PostgresServer server) : EndToEndTests, IClassFixture<Orchard.Store.Tests.PostgresServer>
{
    protected override async Task<ServiceUnderTest> StartAsync() => await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync());
}
