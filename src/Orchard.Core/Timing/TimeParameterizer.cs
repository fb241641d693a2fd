namespace Orchard.Core.Timing;

/// <summary>
/// Times a joint path. Each straight segment qa → qb is run as one trapezoidal profile of a path
/// parameter s ∈ [0, 1] with q = qa + s·(qb − qa); joint j then moves at ṡ·|Δq_j| and accelerates at
/// s̈·|Δq_j|, so the profile's limits are V = min_j vmax_j / |Δq_j| and A = min_j amax_j / |Δq_j|.
/// Every joint then stays within its limits, all joints start and stop together, and the path in joint
/// space is exactly the polyline that was collision-checked.
/// </summary>
public static class TimeParameterizer
{
    /// <summary>A trajectory through every waypoint, at rest at each one.</summary>
    public static JointTrajectory Parameterize(IReadOnlyList<double[]> waypoints, JointSpeedLimits limits)
    {
        ArgumentNullException.ThrowIfNull(waypoints);
        ArgumentNullException.ThrowIfNull(limits);
        if (waypoints.Count == 0)
        {
            throw new ArgumentException("A path needs at least one waypoint.", nameof(waypoints));
        }

        var points = waypoints.Select(w => w.Length == limits.JointCount ? w.ToArray() : throw new ArgumentException("Every waypoint needs one value per joint.", nameof(waypoints))).ToArray();
        if (points.Length == 1)
        {
            points = [points[0], points[0].ToArray()];
        }

        var profiles = new TrapezoidalProfile[points.Length - 1];
        for (var i = 0; i < profiles.Length; i++)
        {
            profiles[i] = SegmentProfile(points[i], points[i + 1], limits);
        }

        return new JointTrajectory(points, profiles);
    }

    /// <summary>
    /// Seconds for the straight joint-space move qa → qb, at rest at both ends. No collision-free path
    /// between them can be faster, so this is the lower bound the sequencer solves on first.
    /// </summary>
    public static double StraightLineSeconds(ReadOnlySpan<double> from, ReadOnlySpan<double> to, JointSpeedLimits limits) =>
        SegmentProfile(from, to, limits).TotalSeconds;

    /// <summary>
    /// A lower bound on any rest-to-rest motion from <paramref name="from"/> to <paramref name="to"/>,
    /// along any path: each joint on its own must cover at least |Δq_j| within its limits, which takes
    /// the trapezoidal time T_j; the motion takes at least max_j T_j. (The synchronised straight line
    /// can take longer, when the speed and the acceleration limits bind on different joints.)
    /// </summary>
    public static double LowerBoundSeconds(ReadOnlySpan<double> from, ReadOnlySpan<double> to, JointSpeedLimits limits)
    {
        ArgumentNullException.ThrowIfNull(limits);
        var bound = 0.0;
        for (var j = 0; j < from.Length; j++)
        {
            var distance = Math.Abs(to[j] - from[j]);
            if (distance > 0)
            {
                bound = Math.Max(bound, new TrapezoidalProfile(distance, limits.MaxVelocity[j], limits.MaxAcceleration[j]).TotalSeconds);
            }
        }

        return bound;
    }

    private static TrapezoidalProfile SegmentProfile(ReadOnlySpan<double> from, ReadOnlySpan<double> to, JointSpeedLimits limits)
    {
        // Scale so s runs over [0, 1]: V = min vmax_j/|Δq_j|, A = min amax_j/|Δq_j|.
        var velocity = double.PositiveInfinity;
        var acceleration = double.PositiveInfinity;
        for (var j = 0; j < from.Length; j++)
        {
            var delta = Math.Abs(to[j] - from[j]);
            if (delta > 0)
            {
                velocity = Math.Min(velocity, limits.MaxVelocity[j] / delta);
                acceleration = Math.Min(acceleration, limits.MaxAcceleration[j] / delta);
            }
        }

        return double.IsPositiveInfinity(velocity)
            ? new TrapezoidalProfile(0, 1, 1)
            : new TrapezoidalProfile(1, velocity, acceleration);
    }
}
