using Orchard.Core.Geometry;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Stops;

/// <summary>
/// Chooses a small set of stops that together reach the most cuts: a greedy set cover over the stand
/// grid (<see cref="StandGrid"/>). Each round ranks the stands whose stowed arm is clear by how many of
/// the still uncovered cuts lie within their reach envelope (a cheap upper bound), analyses the best few
/// in full (reachability of just those cuts), and keeps the one that reaches the most of them, the more
/// preferred stand (near side, nearer the tablet's stand) on a tie. Rounds stop when every cut is
/// covered, the stop budget is spent, or no stand adds <see cref="StopSearchSettings.MinCutsPerExtraStop"/>.
/// The per-stop ordering afterwards (the solver) decides each stop's time, and cuts whose moves fail at
/// their stop fall through to another chosen stop that reaches them.
/// </summary>
public static class StopSelection
{
    /// <summary>The chosen stands in the order chosen, and what each newly covers.</summary>
    public static IReadOnlyList<(StandSurvey Survey, IReadOnlyList<int> Covered)> Choose(
        IReadOnlyList<Stand> grid,
        Func<Stand, StandSurvey> survey,
        IReadOnlyCollection<int> cuts,
        IReadOnlyDictionary<int, Vec3> cutPoints,
        SequencingSettings settings,
        int maxStops,
        Func<bool> pastDeadline,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(survey);
        ArgumentNullException.ThrowIfNull(cuts);
        ArgumentNullException.ThrowIfNull(cutPoints);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(pastDeadline);
        var stops = settings.Stops;
        var chosen = new List<(StandSurvey, IReadOnlyList<int>)>();
        var uncovered = cuts.Order().ToList();
        var used = new HashSet<string>(StringComparer.Ordinal);
        while (uncovered.Count > 0 && chosen.Count < maxStops && !pastDeadline())
        {
            cancellationToken.ThrowIfCancellationRequested();
            var ranked = grid
                .Select((stand, preference) => (Stand: stand, Preference: preference))
                .Where(s => !used.Contains(s.Stand.Key))
                .Select(s => (s.Stand, s.Preference, Survey: survey(s.Stand)))
                .Where(s => s.Survey.StowClear(stops.StowClearanceM))
                .Select(s =>
                {
                    var within = uncovered.Where(c => s.Survey.Envelope.MayReach(cutPoints[c])).ToArray();
                    return (s.Survey, s.Preference, Bound: within.Length, Spread: within.Length == 0 ? 0 : within.Average(c => HorizontalDistanceM(s.Survey, cutPoints[c])));
                })
                .Where(s => s.Bound >= stops.MinCutsPerExtraStop)
                .OrderByDescending(s => s.Bound)
                .ThenBy(s => chosen.Count == 0 ? s.Preference : 0)
                .ThenBy(s => Math.Round(s.Spread, 2))
                .ThenBy(s => s.Preference)
                .Take(Math.Max(1, chosen.Count == 0 ? stops.StandsEvaluatedPerRound : stops.StandsEvaluatedPerLaterRound))
                .Select(s => (s.Survey, s.Preference, s.Bound))
                .ToList();
            if (ranked.Count == 0)
            {
                break;
            }

            (StandSurvey Survey, int Preference, List<int> Covers)? best = null;
            foreach (var (candidate, preference, bound) in ranked)
            {
                if (best is { } b && b.Covers.Count >= bound)
                {
                    break; // No stand further down can beat it: its bound is no higher.
                }

                var reachable = uncovered.Where(c => candidate.Envelope.MayReach(cutPoints[c])).ToArray();
                candidate.Analyse(reachable, settings, cancellationToken);
                var covers = candidate.Reaching(reachable).ToList();
                if (best is null || covers.Count > best.Value.Covers.Count)
                {
                    best = (candidate, preference, covers);
                }
            }

            if (best is not { } pick || pick.Covers.Count < Math.Max(1, chosen.Count == 0 ? 1 : stops.MinCutsPerExtraStop))
            {
                break;
            }

            chosen.Add((pick.Survey, pick.Covers));
            used.Add(pick.Survey.Stand.Key);
            uncovered.RemoveAll(pick.Covers.Contains);
        }

        return chosen;
    }

    /// <summary>Distance from the stand's base to the point, in the horizontal plane.</summary>
    private static double HorizontalDistanceM(StandSurvey survey, in Vec3 point)
    {
        var p = survey.Stand.ArmBase.PositionM;
        return Math.Sqrt(((point.X - p.X) * (point.X - p.X)) + ((point.Y - p.Y) * (point.Y - p.Y)));
    }
}
