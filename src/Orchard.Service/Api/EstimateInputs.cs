using Orchard.Core.Demo;
using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Store;
using TreeRecord = Orchard.Core.Estimates.TreeRecord;

namespace Orchard.Service.Api;

/// <summary>
/// What the estimates are computed from: every stored tree (its latest scan and schedule) and the row
/// layouts. Row layouts are those of the demo orchard where the names match; other rows get a layout
/// from their trees (1.0 m in the row, 3.5 m between rows, as long as its scanned trees) until a row
/// registry exists.
/// </summary>
public static class EstimateInputs
{
    public static async Task<(IReadOnlyList<TreeRecord> Trees, IReadOnlyList<RowLayout> Rows)> LoadAsync(IOrchardStore store, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        var trees = new List<TreeRecord>();
        foreach (var tree in await store.ListTreesAsync(cancellationToken))
        {
            var scanJson = await store.GetScanAsync(tree.LatestScanId, cancellationToken);
            var scan = scanJson is null ? null : OrchardJson.Parse<TreeScan>(scanJson).Value;
            var schedule = tree.CurrentVersion is null ? null : await store.GetCurrentScheduleAsync(tree.TreeId, cancellationToken);
            var parsed = schedule is null ? null : OrchardJson.Parse<Schedule>(schedule.ScheduleJson).Value;
            trees.Add(new TreeRecord(
                tree.TreeId, tree.Block, tree.Row, tree.PositionInRow,
                parsed is not null, parsed?.TotalSeconds,
                parsed?.StepCount ?? 0,
                parsed?.Unscheduled.Count(u => u.Status == UnscheduledStatus.Unreachable) ?? 0,
                parsed?.Unscheduled.Count(u => u.Status == UnscheduledStatus.Moot) ?? 0,
                scan?.Cuts.Count ?? 0,
                scan is null ? 0 : BranchLengthM(scan),
                scan?.Nodes.Count ?? 0));
        }

        var demoRows = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 1)).Rows.ToDictionary(r => (r.Block, r.Name));
        var rows = trees.GroupBy(t => (t.BlockId, t.RowId)).Select(g => demoRows.TryGetValue(g.Key, out var demo)
                ? new RowLayout(g.Key.BlockId, g.Key.RowId, demo.InRowSpacingM, demo.RowSpacingM, demo.RowLengthM, (int)Math.Floor(demo.RowLengthM / demo.InRowSpacingM))
                : new RowLayout(g.Key.BlockId, g.Key.RowId, 1.0, 3.5, g.Count() * 1.0, g.Count()))
            .ToArray();
        return (trees, rows);
    }

    private static double BranchLengthM(TreeScan scan)
    {
        var nodes = scan.Nodes.ToDictionary(n => n.Id);
        return scan.Branches.Sum(b =>
        {
            var (f, t) = (nodes[b.FromNode], nodes[b.ToNode]);
            return Math.Sqrt(((t.XM - f.XM) * (t.XM - f.XM)) + ((t.YM - f.YM) * (t.YM - f.YM)) + ((t.ZM - f.ZM) * (t.ZM - f.ZM)));
        });
    }
}
