using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// Keeps each tree's features in the store (<see cref="ScanFeatures"/>, <see cref="ScheduleFeatures"/>), so
/// the estimates read them in one query instead of parsing every scan and schedule per request. Written
/// when a scan is accepted and when a plan is written; a tree whose stored features do not match its latest
/// scan or current version (written by an older build, or lost to a crash between the two writes) is
/// brought up to date once by <see cref="RefreshAsync(IOrchardStore, Store.TreeRecord, CancellationToken)"/>.
/// </summary>
public static class TreeFeatureIndex
{
    /// <summary>At scan intake: the features of the scan just accepted. A store fault is left for the next refresh.</summary>
    public static async Task RecordScanAsync(IOrchardStore store, string treeId, string scanId, TreeScan scan, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        try
        {
            await store.PutScanFeaturesAsync(treeId, scanId, ScanFeatures.Of(scan), cancellationToken);
        }
        catch (Exception ex) when (StoreFaults.IsTransient(ex))
        {
            // The scan is accepted; its features are worked out again on the next estimate.
        }
    }

    /// <summary>After a plan is written: the tree's features from its latest scan and current schedule. A store fault is left for the next refresh.</summary>
    public static async Task RecordPlanAsync(IOrchardStore store, string treeId, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        try
        {
            if (await store.GetTreeAsync(treeId, cancellationToken) is { } tree)
            {
                await RefreshAsync(store, tree, cancellationToken);
            }
        }
        catch (Exception ex) when (StoreFaults.IsTransient(ex))
        {
            // The plan is written; its features are worked out again on the next estimate.
        }
    }

    /// <summary>Whether the stored features belong to the tree's latest scan and current schedule version.</summary>
    public static bool IsCurrent(Store.TreeRecord tree, TreeFeaturesRecord? features)
    {
        ArgumentNullException.ThrowIfNull(tree);
        return features is not null
            && features.Scan is not null
            && features.ScanId == tree.LatestScanId
            && (tree.CurrentVersion is null || (features.Schedule is not null && features.ScheduleVersion == tree.CurrentVersion));
    }

    /// <summary>Works the tree's features out from its stored scan and schedule and stores them; returns what it found.</summary>
    public static async Task<TreeFeaturesRecord> RefreshAsync(IOrchardStore store, Store.TreeRecord tree, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(tree);
        var scan = await ReadScanAsync(store, tree.LatestScanId, cancellationToken);
        ScanFeatures? scanFeatures = null;
        if (scan is not null)
        {
            scanFeatures = ScanFeatures.Of(scan);
            await store.PutScanFeaturesAsync(tree.TreeId, tree.LatestScanId, scanFeatures, cancellationToken);
        }

        int? version = null;
        ScheduleFeatures? scheduleFeatures = null;
        if (tree.CurrentVersion is not null && await store.GetCurrentScheduleAsync(tree.TreeId, cancellationToken) is { } record
            && OrchardJson.Parse<Schedule>(record.ScheduleJson).Value is { } schedule)
        {
            // Diameters come from the scan the schedule was planned from.
            var plannedFrom = string.IsNullOrEmpty(schedule.ScanId) || schedule.ScanId == tree.LatestScanId
                ? scan
                : await ReadScanAsync(store, schedule.ScanId, cancellationToken) ?? scan;
            version = record.Version;
            scheduleFeatures = ScheduleFeatures.Of(schedule, plannedFrom);
            await store.PutScheduleFeaturesAsync(tree.TreeId, record.Version, scheduleFeatures, cancellationToken);
        }

        return new TreeFeaturesRecord(tree.TreeId, tree.LatestScanId, scanFeatures, version, scheduleFeatures);
    }

    private static async Task<TreeScan?> ReadScanAsync(IOrchardStore store, string scanId, CancellationToken cancellationToken) =>
        await store.GetScanAsync(scanId, cancellationToken) is { } json ? OrchardJson.Parse<TreeScan>(json).Value : null;
}
