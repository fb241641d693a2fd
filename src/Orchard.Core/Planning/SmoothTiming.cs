using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Timing;

namespace Orchard.Core.Planning;

/// <summary>
/// Times a collision-checked joint path without stopping at its corners (<see cref="PathTiming"/>), and proves
/// the blends free (<see cref="TrajectoryCheck"/>): a corner whose blend is not free gets half the blend,
/// again and again, and after three halvings a stop (the arm then stops exactly on the checked corner).
/// What comes back is always proven free when the path's own edges are.
/// </summary>
public static class SmoothTiming
{
    /// <summary>Halvings of a corner's blend before it becomes a stop.</summary>
    public const int Halvings = 3;

    /// <param name="toolIgnoreGroup">For each path segment (by its first waypoint), the limb the tool may touch there; null for none.</param>
    /// <param name="pathChecked">The path's straight edges are already proven free (only blends need checking).</param>
    public static TimedPath Time(IReadOnlyList<double[]> path, JointSpeedLimits limits, CollisionChecker checker, PathTimingOptions? options = null, Func<int, int>? toolIgnoreGroup = null, bool pathChecked = true)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(limits);
        ArgumentNullException.ThrowIfNull(checker);
        options ??= PathTimingOptions.Default;
        var scales = Enumerable.Repeat(1.0, path.Count).ToArray();
        var halved = new int[path.Count];
        while (true)
        {
            var timed = PathTiming.Time(path, limits, options with { CornerBlendScales = scales });
            int Group(int k)
            {
                if (toolIgnoreGroup is null)
                {
                    return CapsuleBvh.NoGroup;
                }

                // A blend takes the stricter of its two segments: none unless both allow the limb.
                var corner = timed.IntervalCorner[k];
                if (corner < 0)
                {
                    return toolIgnoreGroup(timed.IntervalSegment[k]);
                }

                var before = toolIgnoreGroup(corner - 1);
                return before == toolIgnoreGroup(corner) ? before : CapsuleBvh.NoGroup;
            }

            var bad = TrajectoryCheck.BadIntervals(timed.Knots, checker, Group, skipStraight: pathChecked);
            var corners = bad.Select(k => timed.IntervalCorner[k]).Where(c => c >= 0 && scales[c] > 0).Distinct().ToList();
            if (bad.Count == 0)
            {
                return timed;
            }

            if (corners.Count == 0)
            {
                // Only straight parts are left failing: the path itself is not free.
                throw new InvalidOperationException($"A straight part of the path is not free; time only paths whose edges were checked (intervals {string.Join(",", bad.Select(k => $"{k}:seg{timed.IntervalSegment[k]}/corner{timed.IntervalCorner[k]}"))} of {timed.Knots.Count - 1}).");
            }

            foreach (var c in corners)
            {
                scales[c] = ++halved[c] > Halvings ? 0 : scales[c] * 0.5;
            }
        }
    }
}
