namespace Orchard.Core.Timing;

/// <summary>
/// A timed polyline: its knots (see <see cref="KnotContract"/>) and, for each interval between knots k and k+1,
/// the path segment it runs on (index of the waypoint the segment starts at) and, for a blend, the corner it
/// rounds (index of the corner's waypoint; −1 on a straight part).
/// </summary>
public sealed record TimedPath(IReadOnlyList<TrajectoryPoint> Knots, IReadOnlyList<int> IntervalSegment, IReadOnlyList<int> IntervalCorner)
{
    public double DurationS => Knots[^1].TimeS;
}
