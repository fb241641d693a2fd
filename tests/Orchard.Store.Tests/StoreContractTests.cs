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
        new(scan, job, tree, "K", row, position, "arm-1", $$"""{"treeId":"{{tree}}","scan":"{{scan}}"}""", "retry-last");

    private static ScheduleWrite Result(string label) => new($$"""{"schedule":"{{label}}"}""", $$"""{"state":"{{label}}"}""", 12.5, 7, 1);

    private static IdempotencyRecord Idem(string key, string body = "first", string scope = "tablet-1") =>
        new(scope, key, "hash-" + body, 202, $$"""{"answer":"{{body}}"}""", "/jobs/" + body);

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
        Assert.True(await Store.CompleteJobAsync(job.JobId, job.Attempt, "w1", Result("v1"), Ct));
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

        await fresh.PutArmProfileAsync("arm-1", "{}", Ct);
        await fresh.MigrateAsync(Ct);
        await fresh.MigrateAsync(Ct);
        Assert.Equal("{}", await fresh.GetArmProfileAsync("arm-1", Ct));
        Assert.True(await fresh.PingAsync(Ct));
    }

    [Fact]
    public async Task Arm_profiles_are_stored_replaced_and_listed_in_id_order()
    {
        await Store.PutArmProfileAsync("arm-b", """{"v":1}""", Ct);
        await Store.PutArmProfileAsync("arm-a", """{"v":2}""", Ct);
        await Store.PutArmProfileAsync("arm-b", """{"v":3}""", Ct);
        Assert.Equal("""{"v":3}""", await Store.GetArmProfileAsync("arm-b", Ct));
        Assert.Null(await Store.GetArmProfileAsync("arm-z", Ct));
        Assert.Equal(["arm-a", "arm-b"], await Store.ListArmProfileIdsAsync(Ct));
    }

    [Fact]
    public async Task Api_keys_are_found_by_secret_hash_and_counted()
    {
        var created = new DateTimeOffset(2025, 1, 2, 3, 4, 5, TimeSpan.Zero);
        await Store.AddApiKeyAsync(new ApiKeyRecord("k1", "tablet", "aa11", "tablet one", created), Ct);
        await Store.AddApiKeyAsync(new ApiKeyRecord("k2", "admin", "bb22", "admin", created), Ct);
        var found = await Store.FindApiKeyAsync("aa11", Ct);
        Assert.Equal(new ApiKeyRecord("k1", "tablet", "aa11", "tablet one", created), found);
        Assert.Null(await Store.FindApiKeyAsync("cc33", Ct));
        Assert.Equal(2, await Store.CountApiKeysAsync(Ct));
    }

    [Fact]
    public async Task Accepting_a_scan_stores_scan_tree_and_a_queued_plan_job_at_attempt_0()
    {
        var result = await Store.AcceptScanAsync(Scan("T1", "s1", "j1", "R3", 4), null, Ct);
        Assert.Equal(new AcceptResult(true, null), result);

        Assert.Equal("""{"treeId":"T1","scan":"s1"}""", await Store.GetScanAsync("s1", Ct));
        var tree = await Store.GetTreeAsync("T1", Ct);
        Assert.NotNull(tree);
        Assert.Equal(("K", "R3", 4, "arm-1", "s1", "retry-last"), (tree.Block, tree.Row, tree.PositionInRow, tree.ArmProfileId, tree.LatestScanId, tree.RetryPolicy));
        Assert.Null(tree.CurrentVersion);
        var job = await Store.GetJobAsync("j1", Ct);
        Assert.NotNull(job);
        Assert.Equal(("T1", "plan", "s1", "queued", 0), (job.TreeId, job.Kind, job.ScanId, job.Status, job.Attempt));
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
        var first = Idem("key-1", "first");
        Assert.Equal(new AcceptResult(true, null), await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), first, Ct));
        var before = await Store.CountRowsAsync(Ct);

        var again = await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), Idem("key-1", "second"), Ct);
        Assert.False(again.Accepted);
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
        var winnerScan = stored.ResponseJson.Replace("""{"answer":"body""", "", StringComparison.Ordinal).TrimEnd('"', '}');
        Assert.NotNull(await Store.GetScanAsync("s" + winnerScan, Ct));
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
            Assert.Equal(("running", 1, "w1"), (job.Status, job.Attempt, job.LeaseOwner));
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
        Assert.Equal(("j1", stale.Attempt + 1, "new", "running"), (taken.JobId, taken.Attempt, taken.LeaseOwner, taken.Status));

        var before = await Store.CountRowsAsync(Ct);
        Assert.False(await Store.RenewLeaseAsync("j1", stale.Attempt, "old", LongLease, Ct));
        Assert.False(await Store.CompleteJobAsync("j1", stale.Attempt, "old", Result("stale"), Ct));
        Assert.False(await Store.FailJobAsync("j1", stale.Attempt, "old", "stale", Ct));
        Assert.False(await Store.ReleaseJobAsync("j1", stale.Attempt, "old", Ct));
        // The right attempt under the wrong owner, and the right owner at the wrong attempt, are refused too.
        Assert.False(await Store.CompleteJobAsync("j1", taken.Attempt, "old", Result("stale"), Ct));
        Assert.False(await Store.CompleteJobAsync("j1", stale.Attempt, "new", Result("stale"), Ct));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Equal(taken, await Store.GetJobAsync("j1", Ct));
        Assert.Null(await Store.GetCurrentScheduleAsync("T1", Ct));

        Assert.True(await Store.CompleteJobAsync("j1", taken.Attempt, "new", Result("fresh"), Ct));
        Assert.Equal("""{"schedule":"fresh"}""", (await Store.GetCurrentScheduleAsync("T1", Ct))!.ScheduleJson);
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
        Assert.Equal(("failed", 2), (abandoned.Status, abandoned.Attempt));
        Assert.Equal(JobClaimLimit.Reason(2), abandoned.Error);
        Assert.NotNull(abandoned.FinishedAt);
        // The worker that held it last cannot write a result for it any more.
        Assert.False(await limited.CompleteJobAsync("j1", 2, "w2", Result("late"), Ct));
        Assert.Null(await limited.GetCurrentScheduleAsync("T1", Ct));

        // A running job within its lease is never given up, whatever its count.
        Assert.Null(await limited.ClaimJobAsync("w4", LongLease, Ct));
        Assert.Equal("running", (await limited.GetJobAsync("j2", Ct))!.Status);
    }

    [Fact]
    public async Task A_renewed_lease_is_not_taken_over()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var job = await ClaimExpectedAsync("w1", ShortLease);
        Assert.True(await Store.RenewLeaseAsync("j1", job.Attempt, "w1", LongLease, Ct));
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
        Assert.Equal(("queued", null, null), (queued!.Status, queued.LeaseOwner, queued.LeaseUntil));
        Assert.False(await Store.ReleaseJobAsync("j1", job.Attempt, "w1", Ct));

        var again = await ClaimExpectedAsync("w2", LongLease);
        Assert.Equal(("j1", job.Attempt + 1, "w2"), (again.JobId, again.Attempt, again.LeaseOwner));
        Assert.False(await Store.CompleteJobAsync("j1", job.Attempt, "w1", Result("stale"), Ct));
    }

    [Fact]
    public async Task Completing_writes_the_next_schedule_version_the_plan_state_and_the_tree_figures_once()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var first = await ClaimExpectedAsync("w1", LongLease);
        Assert.True(await Store.CompleteJobAsync("j1", first.Attempt, "w1", Result("v1"), Ct));

        var done = await Store.GetJobAsync("j1", Ct);
        Assert.Equal(("done", 1), (done!.Status, done.ScheduleVersion));
        Assert.NotNull(done.FinishedAt);
        var schedule = await Store.GetCurrentScheduleAsync("T1", Ct);
        Assert.Equal(("T1", 1, """{"schedule":"v1"}""", "j1"), (schedule!.TreeId, schedule.Version, schedule.ScheduleJson, schedule.JobId));
        Assert.Equal("""{"state":"v1"}""", await Store.GetPlanStateAsync("T1", Ct));
        var tree = await Store.GetTreeAsync("T1", Ct);
        Assert.Equal((1, 12.5, 7, 1), (tree!.CurrentVersion, tree.TotalSeconds, tree.StepCount, tree.UnscheduledCount));

        // Completing the same job again writes nothing.
        var before = await Store.CountRowsAsync(Ct);
        Assert.False(await Store.CompleteJobAsync("j1", first.Attempt, "w1", Result("again"), Ct));
        Assert.False(await Store.FailJobAsync("j1", first.Attempt, "w1", "late", Ct));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));

        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);
        var second = await ClaimExpectedAsync("w1", LongLease);
        Assert.True(await Store.CompleteJobAsync("j2", second.Attempt, "w1", Result("v2") with { StepCount = 9 }, Ct));
        Assert.Equal((2, "j2"), ((await Store.GetCurrentScheduleAsync("T1", Ct))!.Version, (await Store.GetCurrentScheduleAsync("T1", Ct))!.JobId));
        Assert.Equal("""{"state":"v2"}""", await Store.GetPlanStateAsync("T1", Ct));
        Assert.Equal((2, 9), ((await Store.GetTreeAsync("T1", Ct))!.CurrentVersion, (await Store.GetTreeAsync("T1", Ct))!.StepCount));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((2L, 1L), (counts["schedules"], counts["plan_state"]));
        Assert.Null(await Store.GetCurrentScheduleAsync("T9", Ct));
        Assert.Null(await Store.GetPlanStateAsync("T9", Ct));
    }

    [Fact]
    public async Task Racing_completions_of_one_job_write_exactly_one_result()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var job = await ClaimExpectedAsync("w1", LongLease);
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(Enumerable.Range(0, 6).Select(i => Task.Run(
            () => (i % 2 == 0 ? Store : other).CompleteJobAsync("j1", job.Attempt, "w1", Result($"r{i}"), Ct), Ct)));
        Assert.Single(results, r => r);
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal(1L, counts["schedules"]);
        Assert.Equal(1, (await Store.GetTreeAsync("T1", Ct))!.CurrentVersion);
    }

    [Fact]
    public async Task Racing_jobs_of_one_tree_get_consecutive_versions()
    {
        for (var i = 0; i < 6; i++)
        {
            await Store.AcceptScanAsync(Scan("T1", $"s{i}", $"j{i}"), null, Ct);
        }

        var jobs = new List<JobRecord>();
        for (var i = 0; i < 6; i++)
        {
            jobs.Add(await ClaimExpectedAsync("w1", LongLease));
        }

        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(jobs.Select((j, i) => Task.Run(
            () => (i % 2 == 0 ? Store : other).CompleteJobAsync(j.JobId, j.Attempt, "w1", Result(j.JobId), Ct), Ct)));
        Assert.All(results, Assert.True);
        var versions = new List<int>();
        foreach (var job in jobs)
        {
            versions.Add((await Store.GetJobAsync(job.JobId, Ct))!.ScheduleVersion!.Value);
        }

        Assert.Equal([1, 2, 3, 4, 5, 6], versions.Order());
        Assert.Equal(6, (await Store.GetTreeAsync("T1", Ct))!.CurrentVersion);
        Assert.Equal(6, (await Store.GetCurrentScheduleAsync("T1", Ct))!.Version);
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
        Assert.Equal(("failed", "no reachable cut"), (failed!.Status, failed.Error));
        Assert.NotNull(failed.FinishedAt);

        var before = await Store.CountRowsAsync(Ct);
        Assert.False(await Store.CompleteJobAsync("j1", job.Attempt, "w1", Result("late"), Ct));
        Assert.False(await Store.RenewLeaseAsync("j1", job.Attempt, "w1", LongLease, Ct));
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Null(await Store.ClaimJobAsync("w2", LongLease, Ct));
        Assert.False(await Store.RenewLeaseAsync("nope", 1, "w1", LongLease, Ct));
    }

    [Fact]
    public async Task An_outcome_against_a_stale_version_is_refused_with_the_current_version_and_changes_nothing()
    {
        await TreeWithScheduleAsync();
        await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct);
        var second = await ClaimExpectedAsync("w1", LongLease);
        Assert.True(await Store.CompleteJobAsync("j2", second.Attempt, "w1", Result("v2"), Ct));

        var before = await Store.CountRowsAsync(Ct);
        var stale = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c1", "missed", "j-T1", null), """{"from":"c1"}""", Idem("o-1"), Ct);
        Assert.Equal(new OutcomeResult(false, 2, null, null), stale);
        var unknown = await Store.RecordOutcomeAsync(new OutcomeSubmission("T9", 1, "c1", "done", null, null), null, Idem("o-2"), Ct);
        Assert.Equal(new OutcomeResult(false, null, null, null), unknown);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Null(await Store.GetIdempotencyAsync("tablet-1", "o-1", Ct));
        Assert.Empty(await Store.ListOutcomesAsync("T1", Ct));
    }

    [Fact]
    public async Task An_outcome_before_any_schedule_is_refused()
    {
        await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct);
        var before = await Store.CountRowsAsync(Ct);
        var result = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c1", "done", null, null), null, null, Ct);
        Assert.Equal(new OutcomeResult(false, null, null, null), result);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
    }

    [Fact]
    public async Task Outcomes_are_stored_and_listed_oldest_first_without_a_replan_unless_missed_with_a_payload()
    {
        await TreeWithScheduleAsync();
        var done = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c1", "done", "j-T1", "scan-T1"), null, null, Ct);
        Assert.Equal(new OutcomeResult(true, 1, null, null), done);
        var skipped = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c2", "skipped", null, null), """{"ignored":true}""", null, Ct);
        Assert.Equal(new OutcomeResult(true, 1, null, null), skipped);
        var missedNoPayload = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c3", "missed", null, null), null, null, Ct);
        Assert.Equal(new OutcomeResult(true, 1, null, null), missedNoPayload);

        var outcomes = await Store.ListOutcomesAsync("T1", Ct);
        Assert.Equal([("c1", "done"), ("c2", "skipped"), ("c3", "missed")], outcomes.Select(o => (o.CutId, o.Outcome)));
        Assert.All(outcomes, o => Assert.Equal(("T1", 1), (o.TreeId, o.Version)));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((3L, 1L), (counts["outcomes"], counts["jobs"]));
    }

    [Fact]
    public async Task A_missed_cut_with_a_replan_payload_enqueues_a_replan_job_on_the_latest_scan()
    {
        await TreeWithScheduleAsync();
        var result = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c4", "missed", "j-T1", "scan-T1"), """{"fromCut":"c4"}""", Idem("o-1"), Ct);
        Assert.True(result.Accepted);
        Assert.Equal(1, result.CurrentVersion);
        Assert.NotNull(result.ReplanJobId);
        var job = await Store.GetJobAsync(result.ReplanJobId, Ct);
        Assert.Equal(("T1", "replan", "scan-T1", "queued", 0, """{"fromCut":"c4"}"""), (job!.TreeId, job.Kind, job.ScanId, job.Status, job.Attempt, job.PayloadJson));

        var claimed = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(result.ReplanJobId, claimed.JobId);
        Assert.True(await Store.CompleteJobAsync(claimed.JobId, claimed.Attempt, "w1", Result("replanned"), Ct));
        Assert.Equal(2, (await Store.GetTreeAsync("T1", Ct))!.CurrentVersion);
    }

    [Fact]
    public async Task A_repeated_outcome_idempotency_key_replays_the_first_record_and_stores_nothing()
    {
        await TreeWithScheduleAsync();
        var first = Idem("o-1", "first", "controller-1");
        var accepted = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c4", "missed", null, null), """{"fromCut":"c4"}""", first, Ct);
        Assert.True(accepted.Accepted);
        var before = await Store.CountRowsAsync(Ct);

        var again = await Store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c4", "missed", null, null), """{"fromCut":"c4"}""", Idem("o-1", "second", "controller-1"), Ct);
        Assert.Equal(new OutcomeResult(false, null, null, first), again);
        Assert.Equal(before, await Store.CountRowsAsync(Ct));
        Assert.Single(await Store.ListOutcomesAsync("T1", Ct));
    }

    [Fact]
    public async Task Concurrent_outcomes_with_one_idempotency_key_store_one_outcome_and_one_replan_job()
    {
        await TreeWithScheduleAsync();
        var other = await TrackAsync(OpenSameDatabaseAsync());
        var results = await Task.WhenAll(Enumerable.Range(0, 6).Select(i => Task.Run(
            () => (i % 2 == 0 ? Store : other).RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c4", "missed", null, null), """{"fromCut":"c4"}""", Idem("o-1", $"b{i}"), Ct), Ct)));
        var winner = Assert.Single(results, r => r.Accepted);
        Assert.NotNull(winner.ReplanJobId);
        var stored = await Store.GetIdempotencyAsync("tablet-1", "o-1", Ct);
        Assert.All(results.Where(r => !r.Accepted), r => Assert.Equal(stored, r.Replayed));
        var counts = await Store.CountRowsAsync(Ct);
        Assert.Equal((1L, 2L), (counts["outcomes"], counts["jobs"]));
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
