using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>
/// The controller always gets the plan of the tree as it stands now, over real HTTP on both stores: a
/// re-scan's cuts are never taken for done by outcomes of the scan before; the old schedule is not served
/// once the tree was scanned again; every schedule names its scan (and a re-plan the version it re-plans)
/// and its body's version is its ETag; outcomes are recorded once, never contradicted, and parallel missed
/// reports make one new version.
/// </summary>
public abstract class ScheduleIntegrityTests
{
    private static readonly TimeSpan JobTimeout = TimeSpan.FromSeconds(90);

    protected abstract Task<ServiceUnderTest> StartAsync();

    [Fact]
    public async Task A_rescan_then_a_missed_cut_replans_every_cut_of_the_new_scan()
    {
        await using var service = await StartAsync();
        var tree = DemoScans.Tree(2, cuts: 6);
        var (v1, first) = await PlanAsync(service, DemoScans.Json(2, cuts: 6), "scan-1");
        Assert.Equal(1, v1);
        var steps = Steps(first);
        foreach (var (cut, i) in steps.Take(3).Select((s, i) => (s.GetProperty("cutId").GetString()!, i)))
        {
            using var done = await PostOutcomeAsync(service, tree.TreeId, new { version = 1, cutId = cut, outcome = "done" }, $"done-{i}");
            Assert.Equal(HttpStatusCode.Accepted, done.StatusCode);
        }

        // The tree is scanned again (same cut ids, c01...): none of it is done yet.
        var (v2, second) = await PlanAsync(service, DemoScans.Json(2, cuts: 6), "scan-2");
        Assert.Equal(2, v2);
        Assert.DoesNotContain(Unscheduled(second), u => u.Status == "done");
        var missed = Steps(second)[0];
        using var miss = await PostOutcomeAsync(service, tree.TreeId,
            new { version = 2, cutId = missed.GetProperty("cutId").GetString(), outcome = "missed", configuration = Configuration(missed) }, "miss");
        Assert.Equal(HttpStatusCode.Accepted, miss.StatusCode);
        var replanJob = (await miss.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("replanJobId").GetString()!;
        Assert.Equal("done", (await service.WaitForJobAsync(replanJob, JobTimeout)).GetProperty("status").GetString());

        var (v3, replanned) = await GetScheduleAsync(service, tree.TreeId);
        Assert.Equal(3, v3);
        Assert.Equal(2, replanned.GetProperty("replansVersion").GetInt32());
        Assert.Equal(second.GetProperty("scanId").GetString(), replanned.GetProperty("scanId").GetString());
        // Every cut of the new scan is still to be made (or left out for a reason of its own): none done.
        Assert.DoesNotContain(Unscheduled(replanned), u => u.Status == "done");
        var stillPlanned = Steps(replanned).Select(s => s.GetProperty("cutId").GetString()!).Concat(Unscheduled(replanned).Select(u => u.CutId)).Order(StringComparer.Ordinal);
        Assert.Equal(tree.Cuts.Select(c => c.Id).Order(StringComparer.Ordinal), stillPlanned);
    }

    [Fact]
    public async Task After_a_rescan_the_old_schedule_is_not_served_and_outcomes_against_it_are_refused()
    {
        await using var service = await StartAsync(workers: 0);
        var tree = DemoScans.Tree(4, cuts: 3);
        var (_, first) = await PlanAsync(service, DemoScans.Json(4, cuts: 3), "scan-1", planWith: service);
        var cut = Steps(first)[0].GetProperty("cutId").GetString();

        // A new scan is accepted; no worker plans it yet.
        using var rescan = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(4, cuts: 3)), "scan-2"));
        Assert.Equal(HttpStatusCode.Accepted, rescan.StatusCode);
        var newScan = (await rescan.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("scanId").GetString();

        var stale = service.Request(HttpMethod.Get, $"/api/v1/trees/{tree.TreeId}/schedule", "controller");
        stale.Headers.TryAddWithoutValidation("If-None-Match", "\"v1\"");
        using var notServed = await service.Http.SendAsync(stale);
        Assert.Equal(HttpStatusCode.NotFound, notServed.StatusCode);
        var problem = await notServed.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("application/problem+json", notServed.Content.Headers.ContentType!.MediaType);
        Assert.Equal(newScan, problem.GetProperty("scanId").GetString());
        Assert.Equal(1, problem.GetProperty("previousVersion").GetInt32());

        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        using var refused = await PostOutcomeAsync(service, tree.TreeId, new { version = 1, cutId = cut, outcome = "done" }, "late-done");
        Assert.Equal(HttpStatusCode.Conflict, refused.StatusCode);
        var conflict = await refused.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal(("$.version", "version.rescanned"), (conflict.GetProperty("errors")[0].GetProperty("path").GetString(), conflict.GetProperty("errors")[0].GetProperty("code").GetString()));
        Assert.Equal(newScan, conflict.GetProperty("latestScanId").GetString());
        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));

        using var listing = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager"));
        var listed = (await listing.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray().Single();
        Assert.Equal((newScan, false, 1), (listed.GetProperty("scanId").GetString(), listed.GetProperty("planned").GetBoolean(), listed.GetProperty("scheduleVersion").GetInt32()));
    }

    [Fact]
    public async Task Outcomes_are_recorded_once_replays_keep_their_replan_job_and_parallel_misses_make_one_version()
    {
        await using var service = await StartAsync(workers: 0);
        var tree = DemoScans.Tree(6, cuts: 5);
        var (_, schedule) = await PlanAsync(service, DemoScans.Json(6, cuts: 5), "scan-1", planWith: service);
        var steps = Steps(schedule);
        var (c0, c1, c2, c3) = (Cut(steps[0]), Cut(steps[1]), Cut(steps[2]), Cut(steps[3]));

        using (var done = await PostOutcomeAsync(service, tree.TreeId, new { version = 1, cutId = c0, outcome = "done" }, "d0"))
        {
            Assert.Equal(HttpStatusCode.Accepted, done.StatusCode);
        }

        // The same cut again, without the idempotency key: a duplicate; another word: a contradiction.
        foreach (var (word, code) in new[] { ("done", "outcome.duplicate"), ("skipped", "outcome.contradicts") })
        {
            using var again = await PostOutcomeAsync(service, tree.TreeId, new { version = 1, cutId = c0, outcome = word }, null);
            Assert.Equal(HttpStatusCode.Conflict, again.StatusCode);
            var problem = await again.Content.ReadFromJsonAsync<JsonElement>();
            Assert.Equal(("$.outcome", code), (problem.GetProperty("errors")[0].GetProperty("path").GetString(), problem.GetProperty("errors")[0].GetProperty("code").GetString()));
        }

        // Three different cuts reported missed at once make one re-plan job.
        var misses = await Task.WhenAll(new[] { steps[1], steps[2], steps[3] }.Select((s, i) =>
            PostOutcomeAsync(service, tree.TreeId, new { version = 1, cutId = Cut(s), outcome = "missed", configuration = Configuration(s) }, $"m{i}")));
        var replanJobs = new List<string>();
        foreach (var miss in misses)
        {
            Assert.Equal(HttpStatusCode.Accepted, miss.StatusCode);
            replanJobs.Add((await miss.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("replanJobId").GetString()!);
            miss.Dispose();
        }

        var replanJob = Assert.Single(replanJobs.Distinct());

        // A retried missed report gets its first answer, re-plan job and all.
        using var replay = await PostOutcomeAsync(service, tree.TreeId, new { version = 1, cutId = Cut(steps[1]), outcome = "missed", configuration = Configuration(steps[1]) }, "m0");
        Assert.Equal(HttpStatusCode.Accepted, replay.StatusCode);
        Assert.Equal("true", replay.Headers.GetValues("Idempotent-Replayed").Single());
        Assert.Equal(replanJob, (await replay.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("replanJobId").GetString());
        Assert.Equal($"/api/v1/jobs/{replanJob}", replay.Headers.Location!.ToString());

        // One worker plans it: one new version.
        await using var worker = await ServiceUnderTest.StartWorkerOnAsync(service);
        Assert.Equal("done", (await service.WaitForJobAsync(replanJob, JobTimeout)).GetProperty("status").GetString());
        var (version, replanned) = await GetScheduleAsync(service, tree.TreeId);
        Assert.Equal((2, 1), (version, replanned.GetProperty("replansVersion").GetInt32()));
        Assert.Contains(Unscheduled(replanned), u => u.CutId == c0 && u.Status == "done");
        Assert.DoesNotContain(Steps(replanned), s => Cut(s) == c0);
        Assert.Contains(Steps(replanned), s => Cut(s) == c2 || Cut(s) == c3 || Cut(s) == c1);
        var jobs = (await service.Store.CountRowsAsync(CancellationToken.None))["jobs"];
        Assert.Equal(2, jobs);
    }

    protected virtual Task<ServiceUnderTest> StartAsync(int workers) => StartAsync();

    /// <summary>Posts a scan and waits for its plan; returns the current version and schedule.</summary>
    private static async Task<(int Version, JsonElement Schedule)> PlanAsync(ServiceUnderTest service, string scanJson, string idempotencyKey, ServiceUnderTest? planWith = null)
    {
        using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(scanJson), idempotencyKey));
        Assert.Equal(HttpStatusCode.Accepted, post.StatusCode);
        var accepted = await post.Content.ReadFromJsonAsync<JsonElement>();
        var jobId = accepted.GetProperty("jobId").GetString()!;
        if (planWith is not null)
        {
            await using var worker = await ServiceUnderTest.StartWorkerOnAsync(planWith);
            Assert.Equal("done", (await service.WaitForJobAsync(jobId, JobTimeout)).GetProperty("status").GetString());
        }
        else
        {
            Assert.Equal("done", (await service.WaitForJobAsync(jobId, JobTimeout)).GetProperty("status").GetString());
        }

        var result = await GetScheduleAsync(service, accepted.GetProperty("treeId").GetString()!);
        Assert.Equal(accepted.GetProperty("scanId").GetString(), result.Schedule.GetProperty("scanId").GetString());
        return result;
    }

    /// <summary>The current schedule; its body's version is checked against the ETag.</summary>
    internal static async Task<(int Version, JsonElement Schedule)> GetScheduleAsync(ServiceUnderTest service, string treeId)
    {
        using var get = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{treeId}/schedule", "controller"));
        Assert.Equal(HttpStatusCode.OK, get.StatusCode);
        var schedule = await get.Content.ReadFromJsonAsync<JsonElement>();
        var version = schedule.GetProperty("version").GetInt32();
        Assert.Equal($"\"v{version}\"", get.Headers.ETag!.Tag);
        return (version, schedule);
    }

    private static Task<HttpResponseMessage> PostOutcomeAsync(ServiceUnderTest service, string treeId, object outcome, string? idempotencyKey) =>
        service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{treeId}/outcomes", "controller", JsonContent.Create(outcome), idempotencyKey));

    private static List<JsonElement> Steps(JsonElement schedule) =>
        schedule.GetProperty("stops").EnumerateArray().SelectMany(stop => stop.GetProperty("steps").EnumerateArray()).ToList();

    private static List<(string CutId, string Status)> Unscheduled(JsonElement schedule) =>
        schedule.GetProperty("unscheduled").EnumerateArray().Select(u => (u.GetProperty("cutId").GetString()!, u.GetProperty("status").GetString()!)).ToList();

    private static string Cut(JsonElement step) => step.GetProperty("cutId").GetString()!;

    private static double[] Configuration(JsonElement step) => step.GetProperty("preCutConfiguration").EnumerateArray().Select(v => v.GetDouble()).ToArray();
}

public sealed class SqliteScheduleIntegrityTests : ScheduleIntegrityTests
{
    protected override Task<ServiceUnderTest> StartAsync() => ServiceUnderTest.StartAsync();

    protected override Task<ServiceUnderTest> StartAsync(int workers) => ServiceUnderTest.StartAsync(workers: workers);
}

public sealed class PostgresScheduleIntegrityTests(Orchard.Store.Tests.PostgresServer server) : ScheduleIntegrityTests, IClassFixture<Orchard.Store.Tests.PostgresServer>
{
    protected override async Task<ServiceUnderTest> StartAsync() => await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync());

    protected override async Task<ServiceUnderTest> StartAsync(int workers) => await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync(), workers: workers);

    [Fact]
    public async Task Ten_parallel_scans_of_one_tree_with_three_workers_end_with_the_newest_scans_plan_whose_body_version_is_its_etag()
    {
        // Finding: two jobs of one tree ran at once and the last to finish won, and the body's version was
        // decided apart from the store's (after quick scans the body said 5, the ETag v6).
        await using var service = await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync(), workers: 3);
        var treeId = DemoScans.Tree(8).TreeId;
        var posts = await Task.WhenAll(Enumerable.Range(0, 10).Select(i =>
            service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(8, cuts: 2 + (i % 3))), $"parallel-{i}"))));
        var jobs = new List<string>();
        foreach (var post in posts)
        {
            Assert.Equal(HttpStatusCode.Accepted, post.StatusCode);
            jobs.Add((await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!);
            post.Dispose();
        }

        var statuses = new List<string>();
        foreach (var job in jobs)
        {
            statuses.Add((await service.WaitForJobAsync(job, TimeSpan.FromSeconds(120), "done", "failed", "superseded")).GetProperty("status").GetString()!);
        }

        Assert.All(statuses, s => Assert.True(s is "done" or "superseded", s));
        using var listing = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager"));
        var tree = (await listing.Content.ReadFromJsonAsync<JsonElement>()).EnumerateArray().Single();
        var (version, schedule) = await GetScheduleAsync(service, treeId);
        Assert.Equal(tree.GetProperty("scanId").GetString(), schedule.GetProperty("scanId").GetString());
        Assert.Equal(tree.GetProperty("scheduleVersion").GetInt32(), version);
        Assert.Equal(statuses.Count(s => s == "done"), version);
    }
}
