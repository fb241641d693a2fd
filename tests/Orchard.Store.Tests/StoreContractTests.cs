using Orchard.Core.Sequencing;
using Orchard.Store;

namespace Orchard.Store.Tests;

/// <summary>
/// The one contract both stores must keep. Each test gets a fresh, empty, migrated database from
/// <see cref="CreateStoreAsync"/>; <see cref="OpenSameDatabaseAsync"/> opens a second store on that
/// database (another process, as far as the store can tell).
/// </summary>
public abstract partial class StoreContractTests : IAsyncLifetime
{
    private static readonly TimeSpan LongLease = TimeSpan.FromMinutes(5);
    private static readonly TimeSpan ShortLease = TimeSpan.FromSeconds(1);
    private readonly List<IOrchardStore> opened = [];

    protected IOrchardStore Store { get; private set; } = null!;

    protected static CancellationToken Ct => CancellationToken.None;

    /// <summary>A store on a new, empty database (not migrated).</summary>
    protected abstract Task<IOrchardStore> CreateStoreAsync();

    /// <summary>Another store on the database of <see cref="Store"/>.</summary>
    protected abstract Task<IOrchardStore> OpenSameDatabaseAsync();

    /// <summary>A second store on the same database that gives a job up after <paramref name="maxClaimsPerJob"/> claims.</summary>
    protected abstract Task<IOrchardStore> OpenSameDatabaseAsync(int maxClaimsPerJob);

    public async Task InitializeAsync()
    {
        Store = await TrackAsync(CreateStoreAsync());
        await Store.MigrateAsync(Ct);
    }

    public async Task DisposeAsync()
    {
        foreach (var store in opened)
        {
            switch (store)
            {
                case IAsyncDisposable asyncDisposable:
                    await asyncDisposable.DisposeAsync();
                    break;
                case IDisposable disposable:
                    disposable.Dispose();
                    break;
            }
        }

        await DisposeDatabaseAsync();
    }

    protected virtual ValueTask DisposeDatabaseAsync() => ValueTask.CompletedTask;

    protected async Task<IOrchardStore> TrackAsync(Task<IOrchardStore> creating)
    {
        var store = await creating;
        opened.Add(store);
        return store;
    }

    private static ScanSubmission Scan(string tree, string scan, string job, string row = "R1", int position = 1) =>
        new(scan, job, tree, "K", row, position, "arm-1", $$"""{"treeId":"{{tree}}","scan":"{{scan}}"}""", RetryPolicy.RetryLast);

    /// <summary>A result as a worker writes it: the version in the document is a placeholder the store replaces.</summary>
    private static ScheduleWrite Result(string label) => new($$"""{"schedule":"{{label}}","version":0}""", $$"""{"state":"{{label}}"}""", 12.5, 7, 1);

    /// <summary>The document the store keeps for <see cref="Result"/> written as <paramref name="version"/>.</summary>
    private static string Stored(string label, int version) => $$"""{"schedule":"{{label}}","version":{{version}}}""";

    private static IdempotencyRequest Idem(string key, string body = "first", string scope = "tablet-1") =>
        new(scope, key, "hash-" + body, job => new StoredAnswer(202, $$"""{"answer":"{{body}}","job":"{{job}}"}""", "/jobs/" + body));

    /// <summary>The record <see cref="Idem"/> leaves once its request was accepted with <paramref name="job"/>.</summary>
    private static IdempotencyRecord Kept(string key, string? job, string body = "first", string scope = "tablet-1") =>
        new(scope, key, "hash-" + body, 202, $$"""{"answer":"{{body}}","job":"{{job}}"}""", "/jobs/" + body);

    private static OutcomeSubmission Outcome(string tree, int version, string cut, CutOutcome outcome, string? payload = null) =>
        new(tree, version, cut, outcome) { ReplanPayload = payload };

    private async Task<JobRecord> ClaimExpectedAsync(string worker, TimeSpan lease)
    {
        var job = await Store.ClaimJobAsync(worker, lease, Ct);
        Assert.NotNull(job);
        return job;
    }

    /// <summary>A tree with schedule version 1, its plan job done.</summary>
    private async Task<JobRecord> TreeWithScheduleAsync(string tree = "T1")
    {
        Assert.True((await Store.AcceptScanAsync(Scan(tree, "scan-" + tree, "job-" + tree), null, Ct)).Accepted);
        var job = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync(job.JobId, job.Attempt, "w1", Result("v1"), Ct)).Status);
        return job;
    }

    [Fact]
    public async Task Migrations_from_empty_create_every_table_and_a_second_run_changes_nothing()
    {
        var fresh = await TrackAsync(CreateStoreAsync());
        await fresh.MigrateAsync(Ct);
        var counts = await fresh.CountRowsAsync(Ct);
        Assert.Equal(StoreTables.All.Order(StringComparer.Ordinal), counts.Keys.Order(StringComparer.Ordinal));
        Assert.All(counts.Values, c => Assert.Equal(0, c));

        await fresh.PutArmProfileAsync("arm-1", "{}", null, Ct);
        await fresh.MigrateAsync(Ct);
        await fresh.MigrateAsync(Ct);
        Assert.Equal("{}", await fresh.GetArmProfileAsync("arm-1", Ct));
        Assert.True(await fresh.PingAsync(Ct));
    }

    [Fact]
    public async Task Arm_profiles_are_stored_replaced_and_listed_in_id_order()
    {
        await Store.PutArmProfileAsync("arm-b", """{"v":1}""", "admin-1", Ct);
        await Store.PutArmProfileAsync("arm-a", """{"v":2}""", "admin-1", Ct);
        await Store.PutArmProfileAsync("arm-b", """{"v":3}""", "admin-1", Ct);
        Assert.Equal("""{"v":3}""", await Store.GetArmProfileAsync("arm-b", Ct));
        Assert.Null(await Store.GetArmProfileAsync("arm-z", Ct));
        Assert.Equal(["arm-a", "arm-b"], await Store.ListArmProfileIdsAsync(Ct));
    }

    [Fact]
    public async Task Api_keys_are_found_by_secret_hash_and_counted()
    {
        var created = new DateTimeOffset(2025, 1, 2, 3, 4, 5, TimeSpan.Zero);
        await Store.AddApiKeyAsync(new ApiKeyRecord("k1", "tablet", "aa11", "tablet one", created), null, Ct);
        await Store.AddApiKeyAsync(new ApiKeyRecord("k2", "admin", "bb22", "admin", created), null, Ct);
        var found = await Store.FindApiKeyAsync("aa11", Ct);
        Assert.Equal(new ApiKeyRecord("k1", "tablet", "aa11", "tablet one", created), found);
        Assert.Null(await Store.FindApiKeyAsync("cc33", Ct));
        Assert.Equal(2, await Store.CountApiKeysAsync(Ct));
    }

    [Fact]
    public async Task Accepting_a_scan_stores_scan_tree_and_a_queued_plan_job_at_attempt_0()
    {
        var result = await Store.AcceptScanAsync(Scan("T1", "s1", "j1", "R3", 4), null, Ct);
        Assert.Equal(new AcceptResult(AcceptStatus.Accepted, null), result);

        Assert.Equal("""{"treeId":"T1","scan":"s1"}""", await Store.GetScanAsync("s1", Ct));
        var tree = await Store.GetTreeAsync("T1", Ct);
        Assert.NotNull(tree);
        Assert.Equal(("K", "R3", 4, "arm-1", "s1", RetryPolicy.RetryLast), (tree.Block, tree.Row, tree.PositionInRow, tree.ArmProfileId, tree.LatestScanId, tree.RetryPolicy));
        Assert.Null(tree.CurrentVersion);
        var job = await Store.GetJobAsync("j1", Ct);
        Assert.NotNull(job);
        Assert.Equal(("T1", JobKind.Plan, "s1", JobStatus.Queued, 0), (job.TreeId, job.Kind, job.ScanId, job.Status, job.Attempt));
        Assert.Null(job.LeaseOwner);
        Assert.Null(job.LeaseUntil);
        Assert.Null(job.ScheduleVersion);
        Assert.Null(job.FinishedAt);
    }

    [Fact]
    public async Task A_new_scan_of_a_known_tree_updates_the_tree_and_lists_trees_in_row_order()
    {
        await Store.AcceptScanAsync(Scan("T2", "s1", "j1", "R1", 2), null, Ct);
        await Store.AcceptScanAsync(Scan("T1", "s2", "j2", "R1", 1), null, Ct);
        await Store.AcceptScanAsync(Scan("T2", "s3", "j3", "R1", 3), null, Ct);
        var tree = await Store.GetTreeAsync("T2", Ct);
        Assert.Equal(("s3", 3), (tree!.LatestScanId, tree.PositionInRow));
        Assert.Equal(["T1", "T2"], (await Store.ListTreesAsync(Ct)).Select(t => t.TreeId));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((2L, 3L, 3L), (counts["trees"], counts["scans"], counts["jobs"]));
    }

    [Fact]
    public async Task A_repeated_idempotency_key_stores_nothing_and_replays_the_first_record()
    {
        var first = Kept("key-1", "j1");
        Assert.Equal(new AcceptResult(AcceptStatus.Accepted, null), await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), Idem("key-1", "first"), Ct));
        var before = await Store.CountRowsAsync(Ct);

        var again = await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), Idem("key-1", "second"), Ct);
        Assert.Equal(AcceptStatus.Replayed, again.Status);
        Assert.Equal(first, again.Replayed);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Null(await Store.GetScanAsync("s2", Ct));
        Assert.Equal("s1", (await Store.GetTreeAsync("T1", Ct))!.LatestScanId);
        Assert.Equal(first, await Store.GetIdempotencyAsync("tablet-1", "key-1", Ct));

        // The same key in another scope is another request.
        Assert.True((await Store.AcceptScanAsync(Scan("T1", "s3", "j3"), Idem("key-1", "third", "tablet-2"), Ct)).Accepted);
        Assert.Null(await Store.GetIdempotencyAsync("tablet-3", "key-1", Ct));
    }

    [Fact]
    public async Task Concurrent_accepts_with_one_idempotency_key_store_one_scan_and_replay_it_to_the_rest()
    {
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(Enumerable.Range(0, 8).Select(i => Task.Run(
            () => (i % 2 == 0 ? Store : other).AcceptScanAsync(Scan("T1", $"s{i}", $"j{i}"), Idem("same", $"body{i}"), Ct), Ct)));

        var winner = Assert.Single(results, r => r.Accepted);
        Assert.Null(winner.Replayed);
        var stored = await Store.GetIdempotencyAsync("tablet-1", "same", Ct);
        Assert.NotNull(stored);
        Assert.All(results.Where(r => !r.Accepted), r => Assert.Equal(stored, r.Replayed));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((1L, 1L, 1L, 1L), (counts["scans"], counts["jobs"], counts["trees"], counts["idempotency"]));
        var winnerScan = stored.ResponseJson.Split('"')[3].Replace("body", "", StringComparison.Ordinal);
        Assert.NotNull(await Store.GetScanAsync("s" + winnerScan, Ct));
        Assert.Contains($"\"job\":\"j{winnerScan}\"", stored.ResponseJson, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Claims_take_the_oldest_queued_job_first_and_return_null_when_nothing_is_left()
    {
        Assert.Null(await Store.ClaimJobAsync("w1", LongLease, Ct));
        foreach (var i in new[] { 3, 1, 2 })
        {
            await Store.AcceptScanAsync(Scan($"T{i}", $"s{i}", $"j{i}"), null, Ct);
            await Task.Delay(5, Ct);
        }

        var order = new List<string>();
        for (var i = 0; i < 3; i++)
        {
            var job = await ClaimExpectedAsync("w1", LongLease);
            Assert.Equal((JobStatus.Running, 1, "w1"), (job.Status, job.Attempt, job.LeaseOwner));
            Assert.NotNull(job.LeaseUntil);
            Assert.True(job.LeaseUntil > job.CreatedAt);
            order.Add(job.JobId);
        }

        Assert.Equal(["j3", "j1", "j2"], order);
        Assert.Null(await Store.ClaimJobAsync("w1", LongLease, Ct));
        var figures = await Store.GetQueueFiguresAsync(Ct);
        Assert.Equal((0L, 3L), (figures.Queued, figures.Running));
    }

    [Fact]
    public async Task Concurrent_workers_never_claim_the_same_job_at_the_same_attempt()
    {
        const int jobs = 24;
        for (var i = 0; i < jobs; i++)
        {
            await Store.AcceptScanAsync(Scan($"T{i:00}", $"s{i:00}", $"j{i:00}"), null, Ct);
        }

        var second = await TrackAsync(OpenSameDatabaseAsync());
        var claims = await Task.WhenAll(Enumerable.Range(0, 6).Select(w => Task.Run(async () =>
        {
            var store = w % 2 == 0 ? Store : second;
            var mine = new List<JobRecord>();
            while (await store.ClaimJobAsync($"w{w}", LongLease, Ct) is { } job)
            {
                mine.Add(job);
            }

            return mine;
        }, Ct)));

        var all = claims.SelectMany(c => c).ToList();
        Assert.Equal(jobs, all.Count);
        Assert.Equal(jobs, all.Select(j => (j.JobId, j.Attempt)).Distinct().Count());
        Assert.Equal(jobs, all.Select(j => j.JobId).Distinct().Count());
        Assert.Equal((0L, jobs), ((await Store.GetQueueFiguresAsync(Ct)).Queued, (await Store.GetQueueFiguresAsync(Ct)).Running));
    }

    [Fact]
    public async Task An_expired_lease_is_taken_over_at_the_next_attempt_and_the_old_worker_is_refused()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var stale = await ClaimExpectedAsync("old", ShortLease);

        await Task.Delay(ShortLease + TimeSpan.FromMilliseconds(600), Ct);
        var taken = await ClaimExpectedAsync("new", LongLease);
        Assert.Equal(("j1", stale.Attempt + 1, "new", JobStatus.Running), (taken.JobId, taken.Attempt, taken.LeaseOwner, taken.Status));

        var before = await Store.CountRowsAsync(Ct);
        Assert.Equal(LeaseRenewal.Lost, await Store.RenewLeaseAsync("j1", stale.Attempt, "old", LongLease, Ct));
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j1", stale.Attempt, "old", Result("stale"), Ct)).Status);
        Assert.False(await Store.FailJobAsync("j1", stale.Attempt, "old", "stale", Ct));
        Assert.False(await Store.ReleaseJobAsync("j1", stale.Attempt, "old", Ct));
        // The right attempt under the wrong owner, and the right owner at the wrong attempt, are refused too.
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j1", taken.Attempt, "old", Result("stale"), Ct)).Status);
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j1", stale.Attempt, "new", Result("stale"), Ct)).Status);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Equal(taken, await Store.GetJobAsync("j1", Ct));
        Assert.Null(await Store.GetCurrentScheduleAsync("T1", Ct));

        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync("j1", taken.Attempt, "new", Result("fresh"), Ct)).Status);
        Assert.Equal(Stored("fresh", 1), (await Store.GetCurrentScheduleAsync("T1", Ct))!.ScheduleJson);
    }

    [Fact]
    public async Task A_job_whose_last_allowed_claim_runs_out_is_given_up_not_claimed_again()
    {
        var limited = await TrackAsync(OpenSameDatabaseAsync(maxClaimsPerJob: 2));
        await limited.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        await limited.AcceptScanAsync(Scan("T2", "s2", "j2"), null, Ct);
        var first = (await limited.ClaimJobAsync("w1", ShortLease, Ct))!;
        Assert.Equal(("j1", 1), (first.JobId, first.Attempt));
        await Task.Delay(ShortLease + TimeSpan.FromMilliseconds(600), Ct);
        var second = (await limited.ClaimJobAsync("w2", ShortLease, Ct))!;
        Assert.Equal(("j1", 2), (second.JobId, second.Attempt));
        await Task.Delay(ShortLease + TimeSpan.FromMilliseconds(600), Ct);

        // The third claim gives j1 up and takes the next job instead.
        var third = (await limited.ClaimJobAsync("w3", LongLease, Ct))!;
        Assert.Equal(("j2", 1), (third.JobId, third.Attempt));
        var abandoned = (await limited.GetJobAsync("j1", Ct))!;
        Assert.Equal((JobStatus.Failed, 2), (abandoned.Status, abandoned.Attempt));
        Assert.Equal(JobClaimLimit.Reason(2), abandoned.Error);
        Assert.NotNull(abandoned.FinishedAt);
        // The worker that held it last cannot write a result for it any more.
        Assert.Equal(CompletionStatus.NotHeld, (await limited.CompleteJobAsync("j1", 2, "w2", Result("late"), Ct)).Status);
        Assert.Null(await limited.GetCurrentScheduleAsync("T1", Ct));

        // A running job within its lease is never given up, whatever its count.
        Assert.Null(await limited.ClaimJobAsync("w4", LongLease, Ct));
        Assert.Equal(JobStatus.Running, (await limited.GetJobAsync("j2", Ct))!.Status);
    }

    [Fact]
    public async Task A_renewed_lease_is_not_taken_over()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var job = await ClaimExpectedAsync("w1", ShortLease);
        Assert.Equal(LeaseRenewal.Renewed, await Store.RenewLeaseAsync("j1", job.Attempt, "w1", LongLease, Ct));
        await Task.Delay(ShortLease + TimeSpan.FromMilliseconds(600), Ct);
        Assert.Null(await Store.ClaimJobAsync("w2", LongLease, Ct));
        var renewed = await Store.GetJobAsync("j1", Ct);
        Assert.Equal(("w1", job.Attempt), (renewed!.LeaseOwner, renewed.Attempt));
        Assert.True(renewed.LeaseUntil > job.LeaseUntil);
    }

    [Fact]
    public async Task A_released_job_goes_back_to_the_queue_and_is_claimed_again_at_the_next_attempt()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var job = await ClaimExpectedAsync("w1", LongLease);
        Assert.False(await Store.ReleaseJobAsync("j1", job.Attempt, "w2", Ct));
        Assert.True(await Store.ReleaseJobAsync("j1", job.Attempt, "w1", Ct));
        var queued = await Store.GetJobAsync("j1", Ct);
        Assert.Equal((JobStatus.Queued, null, null), (queued!.Status, queued.LeaseOwner, queued.LeaseUntil));
        Assert.False(await Store.ReleaseJobAsync("j1", job.Attempt, "w1", Ct));

        var again = await ClaimExpectedAsync("w2", LongLease);
        Assert.Equal(("j1", job.Attempt + 1, "w2"), (again.JobId, again.Attempt, again.LeaseOwner));
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j1", job.Attempt, "w1", Result("stale"), Ct)).Status);
    }

    [Fact]
    public async Task Completing_writes_the_next_schedule_version_into_the_document_with_the_plan_state_and_the_tree_figures_once()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var first = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(new CompletionResult(CompletionStatus.Written, 1, null), await Store.CompleteJobAsync("j1", first.Attempt, "w1", Result("v1"), Ct));

        var done = await Store.GetJobAsync("j1", Ct);
        Assert.Equal((JobStatus.Done, 1), (done!.Status, done.ScheduleVersion));
        Assert.NotNull(done.FinishedAt);
        var schedule = await Store.GetCurrentScheduleAsync("T1", Ct);
        Assert.Equal(("T1", 1, Stored("v1", 1), "j1", "s1"), (schedule!.TreeId, schedule.Version, schedule.ScheduleJson, schedule.JobId, schedule.ScanId));
        Assert.Equal(schedule, await Store.GetScheduleAsync("T1", 1, Ct));
        Assert.Equal("""{"state":"v1"}""", await Store.GetPlanStateAsync("T1", "s1", Ct));
        var tree = await Store.GetTreeAsync("T1", Ct);
        Assert.Equal((1, 12.5, 7, 1, "s1", true), (tree!.CurrentVersion, tree.TotalSeconds, tree.StepCount, tree.UnscheduledCount, tree.CurrentScanId, tree.IsPlannedForLatestScan));

        // Completing the same job again writes nothing.
        var before = await Store.CountRowsAsync(Ct);
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j1", first.Attempt, "w1", Result("again"), Ct)).Status);
        Assert.False(await Store.FailJobAsync("j1", first.Attempt, "w1", "late", Ct));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));

        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);
        Assert.False((await Store.GetTreeAsync("T1", Ct))!.IsPlannedForLatestScan);
        var second = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(new CompletionResult(CompletionStatus.Written, 2, null), await Store.CompleteJobAsync("j2", second.Attempt, "w1", Result("v2") with { StepCount = 9 }, Ct));
        Assert.Equal((2, "j2", Stored("v2", 2)), ((await Store.GetCurrentScheduleAsync("T1", Ct))!.Version, (await Store.GetCurrentScheduleAsync("T1", Ct))!.JobId, (await Store.GetCurrentScheduleAsync("T1", Ct))!.ScheduleJson));
        // Plan state is kept per (tree, scan): the first scan's state is not paired with the second's cuts.
        Assert.Equal("""{"state":"v2"}""", await Store.GetPlanStateAsync("T1", "s2", Ct));
        Assert.Equal("""{"state":"v1"}""", await Store.GetPlanStateAsync("T1", "s1", Ct));
        Assert.Equal((2, 9, "s2"), ((await Store.GetTreeAsync("T1", Ct))!.CurrentVersion, (await Store.GetTreeAsync("T1", Ct))!.StepCount, (await Store.GetTreeAsync("T1", Ct))!.CurrentScanId));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((2L, 2L), (counts["schedules"], counts["plan_state"]));
        Assert.Null(await Store.GetCurrentScheduleAsync("T9", Ct));
        Assert.Null(await Store.GetPlanStateAsync("T9", "s1", Ct));
    }

    [Fact]
    public async Task Racing_completions_of_one_job_write_exactly_one_result()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var job = await ClaimExpectedAsync("w1", LongLease);
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(Enumerable.Range(0, 6).Select(i => Task.Run(
            () => (i % 2 == 0 ? Store : other).CompleteJobAsync("j1", job.Attempt, "w1", Result($"r{i}"), Ct), Ct)));
        Assert.Single(results, r => r.Status == CompletionStatus.Written);
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal(1L, counts["schedules"]);
        Assert.Equal(1, (await Store.GetTreeAsync("T1", Ct))!.CurrentVersion);
    }

    [Fact]
    public async Task Two_jobs_of_one_tree_never_run_at_once_and_the_older_scans_job_is_superseded()
    {
        // Finding: two jobs for one tree ran at once and the one that finished last became current, even
        // when it planned an older scan.
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        await Store.AcceptScanAsync(Scan("T2", "s9", "j9"), null, Ct);
        var first = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal("j1", first.JobId);
        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);

        // The tree is busy: the next claim takes the other tree's job, then nothing.
        Assert.Equal("j9", (await ClaimExpectedAsync("w2", LongLease)).JobId);
        Assert.Null(await Store.ClaimJobAsync("w3", LongLease, Ct));

        // The old scan's plan finishes last-but-one: superseded, never current.
        var before = await Store.CountRowsAsync(Ct);
        var late = await Store.CompleteJobAsync("j1", first.Attempt, "w1", Result("old scan"), Ct);
        Assert.Equal(CompletionStatus.Superseded, late.Status);
        Assert.Null(late.Version);
        var superseded = (await Store.GetJobAsync("j1", Ct))!;
        Assert.Equal((JobStatus.Superseded, null), (superseded.Status, superseded.ScheduleVersion));
        Assert.Contains("scanned again", superseded.Error, StringComparison.Ordinal);
        Assert.NotNull(superseded.FinishedAt);
        Assert.Equal(before["schedules"], (await Store.CountRowsAsync(Ct))["schedules"]);
        Assert.Null(await Store.GetCurrentScheduleAsync("T1", Ct));

        // Now the new scan's job runs and becomes version 1.
        var second = await ClaimExpectedAsync("w3", LongLease);
        Assert.Equal("j2", second.JobId);
        Assert.Equal(new CompletionResult(CompletionStatus.Written, 1, null), await Store.CompleteJobAsync("j2", second.Attempt, "w3", Result("new scan"), Ct));
        var schedule = (await Store.GetCurrentScheduleAsync("T1", Ct))!;
        Assert.Equal((1, "s2", Stored("new scan", 1)), (schedule.Version, schedule.ScanId, schedule.ScheduleJson));
    }

    [Fact]
    public async Task Queued_jobs_of_an_older_scan_are_superseded_unplanned_and_a_running_one_at_its_next_renewal()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);
        var claimed = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal("j2", claimed.JobId);
        Assert.Equal(JobStatus.Superseded, (await Store.GetJobAsync("j1", Ct))!.Status);
        Assert.Equal(0, (await Store.GetJobAsync("j1", Ct))!.Attempt);

        await Store.AcceptScanAsync(Scan("T1", "s3", "j3"), null, Ct);
        Assert.Equal(LeaseRenewal.Superseded, await Store.RenewLeaseAsync("j2", claimed.Attempt, "w1", LongLease, Ct));
        Assert.Equal(JobStatus.Superseded, (await Store.GetJobAsync("j2", Ct))!.Status);
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j2", claimed.Attempt, "w1", Result("late"), Ct)).Status);
        Assert.Equal("j3", (await ClaimExpectedAsync("w2", LongLease)).JobId);
    }

    [Fact]
    public async Task Parallel_scans_of_one_tree_with_racing_workers_end_with_the_newest_scans_plan_and_versions_in_the_documents()
    {
        // Finding: after quick scans of one tree the body said version 5 while the store said 6.
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var posting = Task.WhenAll(Enumerable.Range(0, 10).Select(i => Task.Run(() => (i % 2 == 0 ? Store : other).AcceptScanAsync(Scan("T1", $"s{i}", $"j{i}"), null, Ct), Ct)));
        var workers = Enumerable.Range(0, 3).Select(w => Task.Run(async () =>
        {
            var store = w % 2 == 0 ? Store : other;
            var idle = 0;
            while (idle < 20)
            {
                if (await store.ClaimJobAsync($"w{w}", LongLease, Ct) is not { } job)
                {
                    idle++;
                    await Task.Delay(20, Ct);
                    continue;
                }

                idle = 0;
                await store.CompleteJobAsync(job.JobId, job.Attempt, $"w{w}", Result(job.ScanId), Ct);
            }
        }, Ct)).ToList();
        await posting;
        await Task.WhenAll(workers);

        var tree = (await Store.GetTreeAsync("T1", Ct))!;
        var schedule = (await Store.GetCurrentScheduleAsync("T1", Ct))!;
        Assert.Equal(tree.LatestScanId, schedule.ScanId);
        Assert.Equal((tree.CurrentVersion, tree.LatestScanId), (schedule.Version, tree.CurrentScanId));
        Assert.Equal(Stored(tree.LatestScanId, schedule.Version), schedule.ScheduleJson);
        var statuses = new List<JobStatus>();
        for (var i = 0; i < 10; i++)
        {
            var job = (await Store.GetJobAsync($"j{i}", Ct))!;
            statuses.Add(job.Status);
            if (job.Status == JobStatus.Done)
            {
                var written = (await Store.GetScheduleAsync("T1", job.ScheduleVersion!.Value, Ct))!;
                Assert.Equal(Stored(job.ScanId, job.ScheduleVersion.Value), written.ScheduleJson);
            }
        }

        Assert.All(statuses, s => Assert.True(s is JobStatus.Done or JobStatus.Superseded, s.ToString()));
        Assert.Equal(statuses.Count(s => s == JobStatus.Done), (await Store.CountRowsAsync(Ct))["schedules"]);
    }

    [Fact]
    public async Task Failing_is_fenced_and_records_the_reason()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var job = await ClaimExpectedAsync("w1", LongLease);
        Assert.False(await Store.FailJobAsync("j1", job.Attempt, "w2", "not mine", Ct));
        Assert.False(await Store.FailJobAsync("j1", job.Attempt + 1, "w1", "not yet", Ct));
        Assert.True(await Store.FailJobAsync("j1", job.Attempt, "w1", "no reachable cut", Ct));
        var failed = await Store.GetJobAsync("j1", Ct);
        Assert.Equal((JobStatus.Failed, "no reachable cut"), (failed!.Status, failed.Error));
        Assert.NotNull(failed.FinishedAt);

        var before = await Store.CountRowsAsync(Ct);
        Assert.Equal(CompletionStatus.NotHeld, (await Store.CompleteJobAsync("j1", job.Attempt, "w1", Result("late"), Ct)).Status);
        Assert.Equal(LeaseRenewal.Lost, await Store.RenewLeaseAsync("j1", job.Attempt, "w1", LongLease, Ct));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Null(await Store.ClaimJobAsync("w2", LongLease, Ct));
        Assert.Equal(LeaseRenewal.Lost, await Store.RenewLeaseAsync("nope", 1, "w1", LongLease, Ct));
    }

    [Fact]
    public async Task An_outcome_against_a_stale_version_is_refused_with_the_current_version_and_changes_nothing()
    {
        await TreeWithScheduleAsync();
        var missed = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Missed, """{"from":"c1"}"""), null, Ct);
        var replan = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(missed.ReplanJobId, replan.JobId);
        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync(replan.JobId, replan.Attempt, "w1", Result("v2"), Ct)).Status);

        var before = await Store.CountRowsAsync(Ct);
        var stale = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Missed, """{"from":"c2"}"""), Idem("o-1"), Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.StaleVersion, 2, null, null), stale);
        var unknown = await Store.RecordOutcomeAsync(Outcome("T9", 1, "c1", CutOutcome.Done), Idem("o-2"), Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.NoSchedule, null, null, null), unknown);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Null(await Store.GetIdempotencyAsync("tablet-1", "o-1", Ct));
        Assert.Single(await Store.ListOutcomesAsync("T1", "scan-T1", Ct));
    }

    [Fact]
    public async Task An_outcome_before_any_schedule_is_refused()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var before = await Store.CountRowsAsync(Ct);
        var result = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Done), null, Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.NoSchedule, null, null, null), result);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
    }

    [Fact]
    public async Task Outcomes_count_only_against_the_current_scan_and_a_rescanned_trees_old_version_takes_none()
    {
        // Finding: after a re-scan (whose cut ids are again c01...), outcomes of the old scan marked the new
        // scan's cuts as done.
        await TreeWithScheduleAsync();
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Done), null, Ct)).Accepted);
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Skipped), null, Ct)).Accepted);
        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);

        // The tree no longer stands as scanned for version 1.
        var before = await Store.CountRowsAsync(Ct);
        var refused = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c3", CutOutcome.Missed, """{"from":"c3"}"""), null, Ct);
        Assert.Equal(OutcomeStatus.Rescanned, refused.Status);
        Assert.Equal(("s2", 1), (refused.LatestScanId, refused.CurrentVersion));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));

        var job = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync(job.JobId, job.Attempt, "w1", Result("s2"), Ct)).Status);
        Assert.Empty(await Store.ListOutcomesAsync("T1", "s2", Ct));
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 2, "c1", CutOutcome.Missed, """{"from":"c1"}"""), null, Ct)).Accepted);
        var outcomes = await Store.ListOutcomesAsync("T1", "s2", Ct);
        Assert.Equal([("c1", CutOutcome.Missed, 2, "s2")], outcomes.Select(o => (o.CutId, o.Outcome, o.Version, o.ScanId)));
        Assert.Equal([("c1", CutOutcome.Done), ("c2", CutOutcome.Skipped)], (await Store.ListOutcomesAsync("T1", "scan-T1", Ct)).Select(o => (o.CutId, o.Outcome)));
    }

    [Fact]
    public async Task Outcomes_are_stored_and_listed_oldest_first_without_a_replan_unless_missed_with_a_payload()
    {
        await TreeWithScheduleAsync();
        var done = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Done) with { RequestedBy = "controller-1" }, null, Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.Accepted, 1, null, null), done);
        var skipped = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Skipped, """{"ignored":true}"""), null, Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.Accepted, 1, null, null), skipped);
        var missedNoPayload = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c3", CutOutcome.Missed), null, Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.Accepted, 1, null, null), missedNoPayload);

        var outcomes = await Store.ListOutcomesAsync("T1", "scan-T1", Ct);
        Assert.Equal([("c1", CutOutcome.Done), ("c2", CutOutcome.Skipped), ("c3", CutOutcome.Missed)], outcomes.Select(o => (o.CutId, o.Outcome)));
        Assert.All(outcomes, o => Assert.Equal(("T1", 1, "scan-T1"), (o.TreeId, o.Version, o.ScanId)));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((3L, 1L), (counts["outcomes"], counts["jobs"]));
        var audit = await Store.ListAuditAsync(10, Ct);
        Assert.Contains(audit, a => a is { KeyId: "controller-1", Action: "outcome.recorded", Target: "T1" } && a.Detail!.Contains("c1 done", StringComparison.Ordinal));
    }

    [Fact]
    public async Task Duplicate_and_contradictory_outcomes_of_one_cut_are_refused_and_change_nothing()
    {
        // Finding: contradictory or duplicate outcomes for one cut were all accepted.
        await TreeWithScheduleAsync();
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Done), null, Ct)).Accepted);
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Missed), null, Ct)).Accepted);
        var before = await Store.CountRowsAsync(Ct);

        var again = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Done), null, Ct);
        Assert.Equal(OutcomeStatus.Duplicate, again.Status);
        Assert.Equal(("c1", CutOutcome.Done), (again.Earlier!.CutId, again.Earlier.Outcome));
        Assert.Equal(OutcomeStatus.Contradicts, (await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Missed, """{"p":1}"""), null, Ct)).Status);
        Assert.Equal(OutcomeStatus.Contradicts, (await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Skipped), null, Ct)).Status);
        Assert.Equal(OutcomeStatus.Duplicate, (await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Missed), null, Ct)).Status);
        Assert.Equal(OutcomeStatus.Contradicts, (await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Done), null, Ct)).Status);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
    }

    [Fact]
    public async Task A_missed_cut_enqueues_a_replan_of_its_version_and_may_be_reported_again_against_the_replanned_version()
    {
        await TreeWithScheduleAsync();
        var result = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c4", CutOutcome.Missed, """{"fromCut":"c4"}""") with { ReplanJobId = "job-r1", RequestedBy = "controller-1" }, Idem("o-1"), Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.Accepted, 1, "job-r1", null), result);
        var job = await Store.GetJobAsync("job-r1", Ct);
        Assert.Equal(("T1", JobKind.Replan, "scan-T1", JobStatus.Queued, 0, """{"fromCut":"c4"}""", 1, "controller-1"),
            (job!.TreeId, job.Kind, job.ScanId, job.Status, job.Attempt, job.PayloadJson, job.BaseVersion, job.RequestedBy));
        // The idempotent answer names the re-plan job, so a replay does too.
        Assert.Equal(Kept("o-1", "job-r1"), await Store.GetIdempotencyAsync("tablet-1", "o-1", Ct));

        var claimed = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal("job-r1", claimed.JobId);
        Assert.Equal(new CompletionResult(CompletionStatus.Written, 2, null), await Store.CompleteJobAsync(claimed.JobId, claimed.Attempt, "w1", Result("replanned"), Ct));
        Assert.Equal((2, "scan-T1"), ((await Store.GetTreeAsync("T1", Ct))!.CurrentVersion, (await Store.GetTreeAsync("T1", Ct))!.CurrentScanId));

        // Retried in version 2 and missed again: a second re-plan.
        var again = await Store.RecordOutcomeAsync(Outcome("T1", 2, "c4", CutOutcome.Missed, """{"fromCut":"c4"}"""), null, Ct);
        Assert.True(again.Accepted);
        Assert.NotNull(again.ReplanJobId);
        Assert.Equal(2, (await Store.GetJobAsync(again.ReplanJobId, Ct))!.BaseVersion);
    }

    [Fact]
    public async Task Parallel_missed_reports_against_one_version_make_one_replan()
    {
        // Finding: parallel missed reports made one version each.
        await TreeWithScheduleAsync();
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(Enumerable.Range(1, 6).Select(i => Task.Run(
            () => (i % 2 == 0 ? Store : other).RecordOutcomeAsync(Outcome("T1", 1, $"c{i}", CutOutcome.Missed, $$"""{"fromCut":"c{{i}}"}""") with { ReplanJobId = $"job-r{i}" }, null, Ct), Ct)));
        Assert.All(results, r => Assert.Equal(OutcomeStatus.Accepted, r.Status));
        var jobIds = results.Select(r => r.ReplanJobId).Distinct().ToList();
        var only = Assert.Single(jobIds);
        Assert.NotNull(only);
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((6L, 2L), (counts["outcomes"], counts["jobs"]));
    }

    [Fact]
    public async Task A_replan_of_a_rescanned_tree_is_superseded()
    {
        await TreeWithScheduleAsync();
        var missed = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c4", CutOutcome.Missed, """{"fromCut":"c4"}"""), null, Ct);
        var replan = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(missed.ReplanJobId, replan.JobId);
        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);
        var late = await Store.CompleteJobAsync(replan.JobId, replan.Attempt, "w1", Result("replan of the old scan"), Ct);
        Assert.Equal(CompletionStatus.Superseded, late.Status);
        Assert.Equal((1, "scan-T1"), ((await Store.GetTreeAsync("T1", Ct))!.CurrentVersion, (await Store.GetTreeAsync("T1", Ct))!.CurrentScanId));
    }

    [Fact]
    public async Task A_repeated_outcome_idempotency_key_replays_the_first_record_and_stores_nothing()
    {
        await TreeWithScheduleAsync();
        var accepted = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c4", CutOutcome.Missed, """{"fromCut":"c4"}"""), Idem("o-1", "first", "controller-1"), Ct);
        Assert.True(accepted.Accepted);
        var before = await Store.CountRowsAsync(Ct);

        var again = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c4", CutOutcome.Missed, """{"fromCut":"c4"}"""), Idem("o-1", "second", "controller-1"), Ct);
        Assert.Equal(new OutcomeResult(OutcomeStatus.Replayed, null, null, Kept("o-1", accepted.ReplanJobId, "first", "controller-1")), again);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Single(await Store.ListOutcomesAsync("T1", "scan-T1", Ct));
    }

    [Fact]
    public async Task Concurrent_outcomes_with_one_idempotency_key_store_one_outcome_and_one_replan_job()
    {
        await TreeWithScheduleAsync();
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(Enumerable.Range(0, 6).Select(i => Task.Run(
            () => (i % 2 == 0 ? Store : other).RecordOutcomeAsync(Outcome("T1", 1, "c4", CutOutcome.Missed, """{"fromCut":"c4"}"""), Idem("o-1", $"b{i}"), Ct), Ct)));
        var winner = Assert.Single(results, r => r.Accepted);
        Assert.NotNull(winner.ReplanJobId);
        var stored = await Store.GetIdempotencyAsync("tablet-1", "o-1", Ct);
        Assert.Contains(winner.ReplanJobId, stored!.ResponseJson, StringComparison.Ordinal);
        Assert.All(results.Where(r => !r.Accepted), r => Assert.Equal(stored, r.Replayed));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((1L, 2L), (counts["outcomes"], counts["jobs"]));
    }

    [Fact]
    public async Task A_requester_at_its_quota_of_open_jobs_gets_nothing_written()
    {
        ScanSubmission Quota(string scan, string job, string tree) => Scan(tree, scan, job) with { RequestedBy = "tablet-1", MaxOpenJobs = 2 };
        Assert.True((await Store.AcceptScanAsync(Quota("s1", "j1", "T1"), null, Ct)).Accepted);
        Assert.True((await Store.AcceptScanAsync(Quota("s2", "j2", "T2"), Idem("k2"), Ct)).Accepted);
        var before = await Store.CountRowsAsync(Ct);
        var refused = await Store.AcceptScanAsync(Quota("s3", "j3", "T3"), Idem("k3"), Ct);
        Assert.Equal((AcceptStatus.QuotaExceeded, 2), (refused.Status, refused.OpenJobs));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        // Another requester has its own quota.
        Assert.True((await Store.AcceptScanAsync(Scan("T3", "s3", "j3") with { RequestedBy = "tablet-2", MaxOpenJobs = 2 }, null, Ct)).Accepted);

        // A finished job frees a place.
        var job = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync(job.JobId, job.Attempt, "w1", Result("x"), Ct)).Status);
        Assert.True((await Store.AcceptScanAsync(Quota("s4", "j4", "T4"), Idem("k3"), Ct)).Accepted);
    }

    [Fact]
    public async Task Keys_carry_expiry_revocation_last_use_and_the_demo_mark_and_the_last_admin_key_stays()
    {
        var created = new DateTimeOffset(2025, 1, 2, 3, 4, 5, TimeSpan.Zero);
        var expires = created.AddDays(30);
        await Store.AddApiKeyAsync(new ApiKeyRecord("admin-1", "admin", "a1", "first admin", created), null, Ct);
        await Store.AddApiKeyAsync(new ApiKeyRecord("tab-1", "tablet", "t1", "tablet", created) { ExpiresAt = expires }, "admin-1", Ct);
        await Store.AddApiKeyAsync(new ApiKeyRecord("demo-1", "manager", "d1", "demo manager", created) { Demo = true }, null, Ct);

        var tablet = (await Store.FindApiKeyAsync("t1", Ct))!;
        Assert.Equal((expires, (DateTimeOffset?)null, false), (tablet.ExpiresAt, tablet.RevokedAt, tablet.Demo));
        Assert.True(tablet.IsUsableAt(expires.AddSeconds(-1)));
        Assert.False(tablet.IsUsableAt(expires));
        await Store.TouchApiKeyAsync("tab-1", created.AddHours(1), Ct);
        await Store.TouchApiKeyAsync("tab-1", created.AddMinutes(30), Ct);
        Assert.Equal(created.AddHours(1), (await Store.FindApiKeyAsync("t1", Ct))!.LastUsedAt);

        Assert.Equal(RevokeResult.LastAdmin, await Store.RevokeApiKeyAsync("admin-1", "admin-1", Ct));
        Assert.Equal(RevokeResult.NotFound, await Store.RevokeApiKeyAsync("nope", "admin-1", Ct));
        Assert.Equal(RevokeResult.Revoked, await Store.RevokeApiKeyAsync("tab-1", "admin-1", Ct));
        Assert.Equal(RevokeResult.AlreadyRevoked, await Store.RevokeApiKeyAsync("tab-1", "admin-1", Ct));
        Assert.NotNull((await Store.FindApiKeyAsync("t1", Ct))!.RevokedAt);
        Assert.Equal(1, await Store.RevokeDemoKeysAsync(null, Ct));
        Assert.Equal(0, await Store.RevokeDemoKeysAsync(null, Ct));
        Assert.NotNull((await Store.FindApiKeyAsync("d1", Ct))!.RevokedAt);

        Assert.Equal(["admin-1", "demo-1", "tab-1"], (await Store.ListApiKeysAsync(Ct)).Select(k => k.KeyId).Order(StringComparer.Ordinal));
        var audit = await Store.ListAuditAsync(20, Ct);
        Assert.Contains(audit, a => a is { KeyId: "admin-1", Action: "key.revoked", Target: "tab-1" });
        Assert.Contains(audit, a => a is { KeyId: "admin-1", Action: "key.created", Target: "tab-1" });
        Assert.Contains(audit, a => a is { Action: "key.revoked", Target: "demo-1" });
        Assert.True(audit.Zip(audit.Skip(1)).All(p => p.First.AuditId > p.Second.AuditId), "newest first");
    }

    [Fact]
    public async Task Sessions_end_on_sign_out_and_when_their_key_is_revoked()
    {
        var now = DateTimeOffset.UtcNow;
        await Store.AddApiKeyAsync(new ApiKeyRecord("admin-1", "admin", "a1", "admin", now), null, Ct);
        await Store.AddApiKeyAsync(new ApiKeyRecord("man-1", "manager", "m1", "manager", now), null, Ct);
        await Store.CreateSessionAsync(new SessionRecord("sess-1", "man-1", now, now.AddHours(8), null), Ct);
        await Store.CreateSessionAsync(new SessionRecord("sess-2", "man-1", now, now.AddHours(8), null), Ct);
        await Store.CreateSessionAsync(new SessionRecord("sess-3", "admin-1", now, now.AddHours(8), null), Ct);

        var live = (await Store.GetSessionAsync("sess-1", Ct))!;
        Assert.True(live.IsLiveAt(now.AddMinutes(1)));
        Assert.False(live.IsLiveAt(now.AddHours(8)));
        Assert.Equal(("man-1", "manager"), (live.Key.KeyId, live.Key.Role));

        Assert.True(await Store.RevokeSessionAsync("sess-1", Ct));
        Assert.False(await Store.RevokeSessionAsync("sess-1", Ct));
        Assert.False((await Store.GetSessionAsync("sess-1", Ct))!.IsLiveAt(now.AddMinutes(1)));
        Assert.True((await Store.GetSessionAsync("sess-2", Ct))!.IsLiveAt(now.AddMinutes(1)));

        Assert.Equal(RevokeResult.Revoked, await Store.RevokeApiKeyAsync("man-1", "admin-1", Ct));
        Assert.False((await Store.GetSessionAsync("sess-2", Ct))!.IsLiveAt(now.AddMinutes(1)));
        Assert.True((await Store.GetSessionAsync("sess-3", Ct))!.IsLiveAt(now.AddMinutes(1)));
        Assert.Null(await Store.GetSessionAsync("nope", Ct));
        var audit = await Store.ListAuditAsync(20, Ct);
        Assert.Contains(audit, a => a is { KeyId: "man-1", Action: "session.signedOut" });
        Assert.Equal(3, audit.Count(a => a.Action == "session.signedIn"));
    }

    [Fact]
    public async Task The_protection_key_ring_is_shared_by_every_store_on_the_database()
    {
        var other = await TrackAsync(OpenSameDatabaseAsync());
        await Store.AddProtectionKeyAsync(new ProtectionKeyRecord("key-a", "<key id=\"a\"/>"), Ct);
        await other.AddProtectionKeyAsync(new ProtectionKeyRecord("key-b", "<key id=\"b\"/>"), Ct);
        await other.AddProtectionKeyAsync(new ProtectionKeyRecord("key-a", "<key id=\"a\" revoked=\"true\"/>"), Ct);
        var keys = await Store.GetProtectionKeysAsync(Ct);
        Assert.Equal([("key-a", "<key id=\"a\" revoked=\"true\"/>"), ("key-b", "<key id=\"b\"/>")], keys.Select(k => (k.Name, k.Xml)).Order());
    }

    [Fact]
    public async Task Exclusive_sections_of_one_name_never_overlap()
    {
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var inside = 0;
        var most = 0;
        await Task.WhenAll(Enumerable.Range(0, 6).Select(i => (i % 2 == 0 ? Store : other).RunExclusiveAsync("test", async ct =>
        {
            var now = Interlocked.Increment(ref inside);
            InterlockedMax(ref most, now);
            await Task.Delay(30, ct);
            Interlocked.Decrement(ref inside);
        }, Ct)));
        Assert.Equal(1, most);

        static void InterlockedMax(ref int target, int value)
        {
            int seen;
            while ((seen = Volatile.Read(ref target)) < value && Interlocked.CompareExchange(ref target, value, seen) != seen)
            {
            }
        }
    }

    [Fact]
    public async Task Queue_figures_count_queued_and_running_jobs_and_age_the_oldest()
    {
        var empty = await Store.GetQueueFiguresAsync(Ct);
        Assert.Equal(new QueueFigures(0, 0, 0), empty);
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        await Store.AcceptScanAsync(Scan("T2", "s2", "j2"), null, Ct);
        await Store.AcceptScanAsync(Scan("T3", "s3", "j3"), null, Ct);
        await ClaimExpectedAsync("w1", LongLease);
        await Task.Delay(50, Ct);
        var figures = await Store.GetQueueFiguresAsync(Ct);
        Assert.Equal((2L, 1L), (figures.Queued, figures.Running));
        Assert.True(figures.OldestQueuedSeconds > 0);
    }
}
