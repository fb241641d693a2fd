using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>A cut's timed approach from its clear pose to the cut, and when it enters the final part inside the pre-cut pose (where the shear may touch the limb).</summary>
public sealed record TimedApproach(IReadOnlyList<TrajectoryPoint> Knots, double PreCutSecond)
{
    public double DurationS => Knots[^1].TimeS;
}
