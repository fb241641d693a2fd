using System.Data.Common;
using Orchard.Core.Estimates;

namespace Orchard.Store;

/// <summary>The SQL both stores share for the manager's figures (tree features, outcome tallies, cut durations) and the readers of their rows.</summary>
internal static class OrchardRows
{
    public const string FeaturesSelect = """
        SELECT tree_id, scan_id, scan_cut_count, branch_length_m, node_count, schedule_version, total_seconds, scheduled_cuts,
               unreachable_cuts, moot_cuts, hand_cuts, far_side_stops, cut_seconds, diameter_sum_mm, diameter_square_sum_mm2
        FROM tree_features ORDER BY tree_id
        """;

    /// <summary>Distinct cuts per tree and outcome, counting only outcomes against the tree's latest scan.</summary>
    public const string OutcomeCountsSelect = """
        SELECT o.tree_id, o.outcome, count(DISTINCT o.cut_id)
        FROM outcomes o JOIN trees t ON t.tree_id = o.tree_id AND o.scan_id = t.latest_scan_id
        GROUP BY o.tree_id, o.outcome
        """;

    /// <summary>Re-plans written per tree on its latest scan.</summary>
    public const string ReplanCountsSelect = """
        SELECT j.tree_id, count(*)
        FROM jobs j JOIN trees t ON t.tree_id = j.tree_id AND j.scan_id = t.latest_scan_id
        WHERE j.kind = 'replan' AND j.status = 'done'
        GROUP BY j.tree_id
        """;

    public static TreeFeaturesRecord ReadFeatures(DbDataReader r)
    {
        var scan = r.IsDBNull(2) || r.IsDBNull(3) || r.IsDBNull(4)
            ? null
            : new ScanFeatures(r.GetInt32(2), r.GetDouble(3), r.GetInt32(4));
        var schedule = r.IsDBNull(5) || r.IsDBNull(6)
            ? null
            : new ScheduleFeatures(r.GetDouble(6), r.GetInt32(7), r.GetInt32(8), r.GetInt32(9), r.GetInt32(10), r.GetInt32(11), r.GetDouble(12), r.GetDouble(13), r.GetDouble(14));
        return new TreeFeaturesRecord(
            r.GetString(0),
            r.IsDBNull(1) ? null : r.GetString(1),
            scan,
            r.IsDBNull(5) ? null : r.GetInt32(5),
            schedule);
    }

    /// <summary>Tallies from the two counting queries; trees with neither are left out.</summary>
    public static IReadOnlyList<OutcomeTally> Tallies(IEnumerable<(string TreeId, string Outcome, int Cuts)> outcomes, IEnumerable<(string TreeId, int Replans)> replans)
    {
        var byTree = new SortedDictionary<string, OutcomeTally>(StringComparer.Ordinal);
        OutcomeTally Of(string tree) => byTree.TryGetValue(tree, out var t) ? t : new OutcomeTally(tree, 0, 0, 0, 0);
        foreach (var (tree, outcome, cuts) in outcomes)
        {
            var t = Of(tree);
            byTree[tree] = outcome switch
            {
                "done" => t with { CutsDone = cuts },
                "missed" => t with { CutsMissed = cuts },
                "skipped" => t with { CutsSkipped = cuts },
                _ => t,
            };
        }

        foreach (var (tree, count) in replans)
        {
            byTree[tree] = Of(tree) with { Replans = count };
        }

        return byTree.Values.ToArray();
    }
}
