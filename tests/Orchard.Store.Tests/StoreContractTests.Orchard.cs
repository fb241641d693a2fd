using Orchard.Core.Estimates;

namespace Orchard.Store.Tests;

/// <summary>The contract for the manager's figures: orchard documents, tree features, progress tallies, cut durations.</summary>
public abstract partial class StoreContractTests
{
    private static readonly ScanFeatures SomeScan = new(12, 23.5, 140);

    private static readonly ScheduleFeatures SomeSchedule = new(123.5, 9, 2, 1, 3, 1, 27.25, 150.5, 2600.25);

    [Fact]
    public async Task Orchard_documents_are_stored_replaced_and_read_by_name()
    {
        Assert.Null(await Store.GetOrchardDocumentAsync("rows", Ct));
        await Store.PutOrchardDocumentAsync("rows", """{"blocks":[]}""", "key-admin", Ct);
        await Store.PutOrchardDocumentAsync("rates", """{"handSecondsPerCut":20}""", "key-manager", Ct);
        await Store.PutOrchardDocumentAsync("rows", """{"blocks":[1]}""", "key-admin", Ct);

        Assert.Equal("""{"blocks":[1]}""", await Store.GetOrchardDocumentAsync("rows", Ct));
        Assert.Equal("""{"handSecondsPerCut":20}""", await Store.GetOrchardDocumentAsync("rates", Ct));
        Assert.Equal(2L, (await Store.CountRowsAsync(Ct))["orchard_documents"]);
        // Each write is audited with who made it, newest first.
        Assert.Equal(
            [("key-admin", "orchardDocument.put", "rows"), ("key-manager", "orchardDocument.put", "rates"), ("key-admin", "orchardDocument.put", "rows")],
            (await Store.ListAuditAsync(10, Ct)).Select(a => (a.KeyId, a.Action, a.Target)));
    }

    [Fact]
    public async Task Scan_features_are_kept_only_for_the_trees_latest_scan()
    {
        Assert.False(await Store.PutScanFeaturesAsync("T1", "s1", SomeScan, Ct)); // no such tree yet
        Assert.True((await Store.AcceptScanAsync(Scan("T1", "s1", "j1"), null, Ct)).Accepted);
        Assert.True(await Store.PutScanFeaturesAsync("T1", "s1", SomeScan, Ct));
        Assert.False(await Store.PutScanFeaturesAsync("T1", "s0", SomeScan with { CutCount = 99 }, Ct));

        var features = Assert.Single(await Store.ListTreeFeaturesAsync(Ct));
        Assert.Equal(new TreeFeaturesRecord("T1", "s1", SomeScan, null, null), features);

        Assert.True((await Store.AcceptScanAsync(Scan("T1", "s2", "j2"), null, Ct)).Accepted);
        Assert.False(await Store.PutScanFeaturesAsync("T1", "s1", SomeScan, Ct)); // s1 is no longer the latest
        Assert.True(await Store.PutScanFeaturesAsync("T1", "s2", SomeScan with { CutCount = 13 }, Ct));
        Assert.Equal(13, Assert.Single(await Store.ListTreeFeaturesAsync(Ct)).Scan!.CutCount);
    }

    [Fact]
    public async Task Schedule_features_are_kept_only_for_the_trees_current_version_beside_its_scan_features()
    {
        Assert.True((await Store.AcceptScanAsync(Scan("T1", "scan-T1", "job-T1"), null, Ct)).Accepted);
        Assert.True(await Store.PutScanFeaturesAsync("T1", "scan-T1", SomeScan, Ct));
        Assert.False(await Store.PutScheduleFeaturesAsync("T1", 1, SomeSchedule, Ct)); // not planned yet
        var job = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync(job.JobId, job.Attempt, "w1", Result("v1"), Ct)).Status);

        Assert.True(await Store.PutScheduleFeaturesAsync("T1", 1, SomeSchedule, Ct));
        Assert.False(await Store.PutScheduleFeaturesAsync("T1", 2, SomeSchedule, Ct));

        Assert.Equal(new TreeFeaturesRecord("T1", "scan-T1", SomeScan, 1, SomeSchedule), Assert.Single(await Store.ListTreeFeaturesAsync(Ct)));
    }

    [Fact]
    public async Task Schedule_features_without_scan_features_leave_the_scan_part_empty()
    {
        await TreeWithScheduleAsync("T2");
        Assert.True(await Store.PutScheduleFeaturesAsync("T2", 1, SomeSchedule, Ct));
        Assert.Equal(new TreeFeaturesRecord("T2", null, null, 1, SomeSchedule), Assert.Single(await Store.ListTreeFeaturesAsync(Ct)));
    }

    [Fact]
    public async Task Outcome_tallies_count_distinct_cuts_and_written_replans_on_the_latest_scan_per_tree()
    {
        await TreeWithScheduleAsync("T1");
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c1", CutOutcome.Done), null, Ct)).Accepted);
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c2", CutOutcome.Done), null, Ct)).Accepted);
        Assert.True((await Store.RecordOutcomeAsync(Outcome("T1", 1, "c3", CutOutcome.Skipped), null, Ct)).Accepted);
        var missed = await Store.RecordOutcomeAsync(Outcome("T1", 1, "c4", CutOutcome.Missed, """{"fromCut":"c4"}"""), null, Ct);
        Assert.NotNull(missed.ReplanJobId);
        Assert.Equal([new OutcomeTally("T1", 2, 1, 1, 0)], await Store.ListOutcomeTalliesAsync(Ct));

        var replan = await ClaimExpectedAsync("w1", LongLease);
        Assert.Equal(CompletionStatus.Written, (await Store.CompleteJobAsync(replan.JobId, replan.Attempt, "w1", Result("v2"), Ct)).Status);
        Assert.Equal([new OutcomeTally("T1", 2, 1, 1, 1)], await Store.ListOutcomeTalliesAsync(Ct));

        // A new scan starts the tree's progress afresh.
        Assert.True((await Store.AcceptScanAsync(Scan("T1", "scan-T1b", "job-T1b"), null, Ct)).Accepted);
        Assert.Empty(await Store.ListOutcomeTalliesAsync(Ct));
    }

    [Fact]
    public async Task Cut_durations_are_kept_once_per_tree_version_and_cut()
    {
        await TreeWithScheduleAsync("T1");
        var at = DateTimeOffset.UnixEpoch;
        Assert.True(await Store.AddCutDurationAsync(new CutDurationRecord("T1", "K", 1, "c1", 12.5, 1.75, at), Ct));
        Assert.True(await Store.AddCutDurationAsync(new CutDurationRecord("T1", "K", 1, "c2", 8, 1.25, at), Ct));
        Assert.False(await Store.AddCutDurationAsync(new CutDurationRecord("T1", "K", 1, "c1", 12.5, 9.0, at), Ct));

        var durations = await Store.ListCutDurationsAsync(Ct);
        Assert.Equal([("c1", 12.5, 1.75), ("c2", 8.0, 1.25)], durations.Select(d => (d.CutId, d.DiameterMm, d.DurationSeconds)));
        Assert.All(durations, d => Assert.Equal(("T1", "K", 1), (d.TreeId, d.Block, d.Version)));
    }
}
