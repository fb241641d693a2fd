using Orchard.Core.Collision;
using Orchard.Core.Planning;
using Orchard.Core.Reachability;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Times a straight tool line given as configurations and their stations (a cut's approach from its clear pose,
/// or a re-plan's retreat): the joint polyline through them, timed without stopping at its corners
/// (<see cref="SmoothTiming"/>, blends proven free), each segment's path speed and acceleration capped so the
/// tool keeps to a Cartesian speed and acceleration (the joint-space length of a segment over its Cartesian
/// length converts one into the other). The approach runs at the clear speed out beyond the pre-cut pose and at
/// the reduced approach speed inside it, where only the shear may touch the limb being cut. The retract is the
/// approach run backwards (<see cref="KnotContract.Reversed"/>).
/// </summary>
public static class ApproachTiming
{
    public static TimedApproach Time(CutCandidate candidate, int limbGroup, JointSpeedLimits limits, CollisionChecker checker, SequencingSettings settings)
    {
        ArgumentNullException.ThrowIfNull(candidate);
        ArgumentNullException.ThrowIfNull(settings);
        var timed = TimeLine(candidate.ApproachPath, candidate.ApproachStationsM, limits, checker,
            i => i >= candidate.PreCutIndex ? settings.ApproachSpeedMS : settings.ClearSpeedMS, settings.ApproachAccelerationMS2,
            i => i >= candidate.PreCutIndex ? limbGroup : Geometry.CapsuleBvh.NoGroup);

        // From the first knot after which every interval runs inside the pre-cut pose on, the tool may touch the limb.
        var knots = timed.Knots;
        var inside = knots.Count - 1;
        while (inside > 0 && timed.IntervalSegment[inside - 1] >= candidate.PreCutIndex && timed.IntervalCorner[inside - 1] != candidate.PreCutIndex)
        {
            inside--;
        }

        return new TimedApproach(knots, knots[inside].TimeS);
    }

    /// <summary>A straight tool line at a tool speed per segment (<paramref name="toolSpeedMS"/> of the segment's first waypoint).</summary>
    public static TimedPath TimeLine(IReadOnlyList<double[]> path, IReadOnlyList<double> stations, JointSpeedLimits limits, CollisionChecker checker, Func<int, double> toolSpeedMS, double toolAccelerationMS2, Func<int, int> toolIgnoreGroup)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(stations);
        ArgumentNullException.ThrowIfNull(limits);
        ArgumentNullException.ThrowIfNull(checker);
        ArgumentNullException.ThrowIfNull(toolSpeedMS);
        var speed = new double[Math.Max(0, path.Count - 1)];
        var acceleration = new double[speed.Length];
        for (var i = 0; i < speed.Length; i++)
        {
            var joint = 0.0;
            for (var j = 0; j < path[i].Length; j++)
            {
                joint += (path[i + 1][j] - path[i][j]) * (path[i + 1][j] - path[i][j]);
            }

            var ratio = Math.Sqrt(joint) / Math.Max(1e-9, stations[i + 1] - stations[i]);
            speed[i] = toolSpeedMS(i) * ratio;
            acceleration[i] = toolAccelerationMS2 * ratio;
        }

        var options = PathTimingOptions.Default with { SegmentSpeedCaps = speed, SegmentAccelerationCaps = acceleration };
        return SmoothTiming.Time(path, limits, checker, options, toolIgnoreGroup);
    }
}
