using Orchard.Core.Stops;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Orders the cuts assigned to one stop: one tour node per usable candidate of each cut (exactly one
/// visited per cut), an open path from the stop's start, and the retry rule for a missed cut as arc
/// penalties (retry now: only its candidates may follow the start; retry last: nothing may follow them),
/// which the solver handles far faster than a precedence over every other cut. Moot cuts kept under
/// <see cref="MootPolicy.CutFirst"/> come before the cut that removes their wood (a group precedence).
/// </summary>
internal static class StopSequencer
{
    public static StopOrder Order(
        StandSurvey survey,
        IReadOnlyList<int> cuts,
        TourNode start,
        int? retriedCut,
        RetryPolicy policy,
        IReadOnlyList<(int Before, int After)> precedences,
        MoveOracle oracle,
        Func<bool> pastDeadline,
        CancellationToken cancellationToken)
    {
        var scan = survey.Cell.Scan;
        var arm = survey.Cell.Profile;
        var settings = oracle.Settings;
        var nodes = new List<TourNode> { start };
        var groups = new List<IReadOnlyList<int>>();
        var groupOfCut = new Dictionary<int, int>();
        foreach (var c in cuts)
        {
            var members = new List<int>();
            var cutSeconds = arm.CutTime.SecondsFor(scan.Cuts[c].DiameterMm);
            var reach = survey.Reach(c);
            foreach (var candidate in reach.Candidates)
            {
                var approach = survey.ApproachOf(candidate, () => ApproachTiming.Time(candidate, reach.LimbGroup, oracle.Limits, oracle.Checker, settings));
                members.Add(nodes.Count);
                nodes.Add(new TourNode($"c{c}/{candidate.CandidateIndex}", c, candidate, candidate.ClearConfiguration.ToArray(), (2 * approach.DurationS) + cutSeconds, approach));
            }

            if (members.Count > 0)
            {
                groupOfCut[c] = groups.Count;
                groups.Add(members);
            }
        }

        var groupPrecedences = precedences
            .Where(p => groupOfCut.ContainsKey(p.Before) && groupOfCut.ContainsKey(p.After))
            .Select(p => new GroupPrecedence(groupOfCut[p.Before], groupOfCut[p.After]))
            .ToList();
        var first = new HashSet<int>();
        var last = new HashSet<int>();
        if (retriedCut is { } retried && groupOfCut.TryGetValue(retried, out var retriedGroup) && policy != RetryPolicy.Drop)
        {
            (policy == RetryPolicy.RetryNow ? first : last).UnionWith(groups[retriedGroup]);
        }

        var (order, rounds) = LazyTourSearch.Order(nodes, groups, groupPrecedences, first, last, oracle, pastDeadline, cancellationToken, WarmStart(nodes, groups, survey.LastOrder, retriedCut, policy));
        return new StopOrder(nodes, order, rounds);
    }

    /// <summary>
    /// A re-plan's first tour: the stop's previous order (node keys) with what is no longer to be done left out,
    /// cuts new to the stop after it (their first candidate), and the retried cut first or last as its policy
    /// says; null when the stop has no previous order.
    /// </summary>
    private static List<int>? WarmStart(List<TourNode> nodes, List<IReadOnlyList<int>> groups, IReadOnlyList<string> previous, int? retriedCut, RetryPolicy policy)
    {
        if (previous.Count == 0)
        {
            return null;
        }

        var byKey = nodes.Select((node, index) => (node.Key, index)).ToDictionary(p => p.Key, p => p.index, StringComparer.Ordinal);
        var order = previous.Where(byKey.ContainsKey).Select(k => byKey[k]).ToList();
        var cutsIn = order.Select(i => nodes[i].CutIndex).ToHashSet();
        order.AddRange(groups.Where(g => !cutsIn.Contains(nodes[g[0]].CutIndex)).Select(g => g[0]));
        if (retriedCut is { } retried && policy != RetryPolicy.Drop && order.FindIndex(i => nodes[i].CutIndex == retried) is var at and >= 0)
        {
            var node = order[at];
            order.RemoveAt(at);
            order.Insert(policy == RetryPolicy.RetryNow ? 0 : order.Count, node);
        }

        return [0, .. order];
    }

    /// <summary>The node a stop starts from: the stowed arm, or a configuration the arm reported (after its retreat).</summary>
    public static TourNode StartNode(double[] configuration, bool stowed) =>
        new(stowed ? ScheduleBuilder.StowKey : "at:" + StableHash.Of(configuration).ToString("x16", System.Globalization.CultureInfo.InvariantCulture), -1, null, configuration, 0, null);
}
