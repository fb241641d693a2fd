using Orchard.Core.Estimates;
using Orchard.Service.Application;
using Orchard.Store;
using StoredTree = Orchard.Store.TreeRecord;
using TreeRecord = Orchard.Core.Estimates.TreeRecord;

namespace Orchard.Service.Api;

/// <summary>
/// What the estimates are computed from, read in a fixed number of queries whatever the number of trees:
/// the trees, their stored features (<see cref="TreeFeatureIndex"/>), the row registry, the reference rates
/// and the controller's progress. Rows come from the registry only; a row that has trees but is not
/// registered gets a stand-in layout (1.0 m between trees, 3.5 m between rows, as long as its trees, one
/// side) and is listed in <see cref="UnregisteredRows"/>, so the page can say so.
/// </summary>
/// <param name="Trees">Every tree as the estimates see it.</param>
/// <param name="Rows">Registered rows in registry order, then stand-ins for unregistered ones.</param>
/// <param name="UnregisteredRows">(block, row) of the stand-ins.</param>
/// <param name="Rates">The orchard's stored reference rates.</param>
/// <param name="Progress">Outcome tallies per tree on its latest scan.</param>
/// <param name="FeaturesRefreshed">Trees whose stored features were out of date and were worked out again for this answer.</param>
/// <param name="CutTimes">Per block with trees or measured cuts: its cut-time model (measured, or the arm profile's while too few cuts are in).</param>
public sealed record EstimateInputs(
    IReadOnlyList<TreeRecord> Trees,
    IReadOnlyList<RowLayout> Rows,
    IReadOnlySet<(string Block, string Row)> UnregisteredRows,
    ReferenceRates Rates,
    IReadOnlyList<OutcomeTally> Progress,
    int FeaturesRefreshed,
    IReadOnlyDictionary<string, CutTimeFit> CutTimes)
{
    /// <summary>Stand-in layout of an unregistered row: metres between trees and between rows.</summary>
    public const double StandInTreeSpacingM = 1.0, StandInRowSpacingM = 3.5;

    public static async Task<EstimateInputs> LoadAsync(IOrchardStore store, CutTimeFitSettings cutTimeSettings, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(cutTimeSettings);
        var stored = await store.ListTreesAsync(cancellationToken);
        var features = (await store.ListTreeFeaturesAsync(cancellationToken)).ToDictionary(f => f.TreeId, StringComparer.Ordinal);
        var refreshed = 0;
        var trees = new List<TreeRecord>(stored.Count);
        foreach (var tree in stored)
        {
            var known = features.GetValueOrDefault(tree.TreeId);
            if (!TreeFeatureIndex.IsCurrent(tree, known))
            {
                known = await TreeFeatureIndex.RefreshAsync(store, tree, cancellationToken);
                refreshed++;
            }

            trees.Add(Record(tree, known!));
        }

        var registry = await OrchardDocuments.RowsAsync(store, cancellationToken);
        var rows = RowLayout.FromRegistry(registry).ToList();
        var registered = rows.Select(r => (r.BlockId, r.RowId)).ToHashSet();
        var unregistered = new HashSet<(string Block, string Row)>();
        foreach (var group in trees.GroupBy(t => (t.BlockId, t.RowId)).Where(g => !registered.Contains(g.Key)))
        {
            unregistered.Add(group.Key);
            rows.Add(new RowLayout(group.Key.BlockId, group.Key.RowId, StandInTreeSpacingM, StandInRowSpacingM, group.Count() * StandInTreeSpacingM, group.Count(), BothSides: false));
        }

        var measured = (await store.ListCutDurationsAsync(cancellationToken)).ToLookup(d => d.Block, StringComparer.Ordinal);
        var cutTimes = rows.Select(r => r.BlockId).Concat(measured.Select(g => g.Key)).Distinct(StringComparer.Ordinal)
            .ToDictionary(b => b, b => CutTimeFit.Fit(b, measured[b].Select(d => (d.DiameterMm, d.DurationSeconds)), cutTimeSettings), StringComparer.Ordinal);
        return new EstimateInputs(
            trees,
            rows,
            unregistered,
            await OrchardDocuments.RatesAsync(store, cancellationToken),
            await store.ListOutcomeTalliesAsync(cancellationToken),
            refreshed,
            cutTimes);
    }

    private static TreeRecord Record(StoredTree tree, TreeFeaturesRecord features)
    {
        var scan = features.Scan;
        // Only a schedule of the tree's newest scan counts: a tree scanned again is predicted from its new scan
        // until its new plan lands (its old schedule is of a tree that no longer stands so).
        var schedule = tree.IsPlannedForLatestScan ? features.Schedule : null;
        return new TreeRecord(
            tree.TreeId, tree.Block, tree.Row, tree.PositionInRow,
            schedule is not null, schedule?.TotalSeconds,
            schedule?.ScheduledCuts ?? 0,
            schedule?.UnreachableCuts ?? 0,
            schedule?.MootCuts ?? 0,
            scan?.CutCount ?? 0,
            scan?.BranchLengthM ?? 0,
            scan?.NodeCount ?? 0,
            schedule?.FarSideStops ?? 0,
            schedule?.HandCuts ?? 0,
            schedule?.CutSeconds ?? 0,
            schedule?.DiameterSumMm ?? 0);
    }
}
