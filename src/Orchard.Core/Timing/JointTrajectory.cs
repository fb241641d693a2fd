namespace Orchard.Core.Timing;

/// <summary>
/// A timed joint path: straight joint-space segments between waypoints, each a synchronised
/// rest-to-rest trapezoidal profile. The arm stops at every waypoint, so the motion never leaves the
/// collision-checked polyline (a blended corner would cut across unchecked space).
/// </summary>
public sealed class JointTrajectory
{
    private readonly double[][] _waypoints;
    private readonly TrapezoidalProfile[] _profiles;
    private readonly double[] _segmentStartS;

    internal JointTrajectory(double[][] waypoints, TrapezoidalProfile[] profiles)
    {
        _waypoints = waypoints;
        _profiles = profiles;
        _segmentStartS = new double[profiles.Length + 1];
        for (var i = 0; i < profiles.Length; i++)
        {
            _segmentStartS[i + 1] = _segmentStartS[i] + profiles[i].TotalSeconds;
        }
    }

    public int JointCount => _waypoints[0].Length;

    public double DurationS => _segmentStartS[^1];

    public IReadOnlyList<double[]> Waypoints => _waypoints;

    /// <summary>Time at which the trajectory reaches waypoint <paramref name="index"/>.</summary>
    public double WaypointTimeS(int index) => _segmentStartS[index];

    /// <summary>Joint positions, velocities and accelerations at time t (clamped to [0, duration]).</summary>
    public void Sample(double t, Span<double> position, Span<double> velocity, Span<double> acceleration)
    {
        var segment = Segment(t);
        var from = _waypoints[segment];
        var to = _waypoints[segment + 1];
        var profile = _profiles[segment];
        var local = Math.Clamp(t - _segmentStartS[segment], 0, profile.TotalSeconds);

        // The profile runs the path parameter s over [0, 1]: q = qa + s·Δq, q̇ = ṡ·Δq, q̈ = s̈·Δq.
        var s = profile.Distance > 0 ? profile.Position(local) / profile.Distance : 1;
        var sd = profile.Distance > 0 ? profile.Velocity(local) / profile.Distance : 0;
        var sdd = profile.Distance > 0 ? profile.AccelerationAt(local) / profile.Distance : 0;
        for (var j = 0; j < from.Length; j++)
        {
            var delta = to[j] - from[j];
            position[j] = s >= 1 ? to[j] : from[j] + (s * delta);
            velocity[j] = sd * delta;
            acceleration[j] = sdd * delta;
        }
    }

    /// <summary>The knots: every waypoint and every change of acceleration, in time order.</summary>
    public IReadOnlyList<TrajectoryPoint> Knots()
    {
        var knots = new List<TrajectoryPoint>();
        var n = JointCount;
        var position = new double[n];
        var velocity = new double[n];
        var acceleration = new double[n];
        void Add(double t, double[]? exact)
        {
            Sample(t, position, velocity, acceleration);
            knots.Add(new TrajectoryPoint(t, (exact ?? position).ToArray(), exact is null ? velocity.ToArray() : new double[n]));
        }

        Add(0, _waypoints[0]);
        for (var i = 0; i < _profiles.Length; i++)
        {
            var start = _segmentStartS[i];
            var profile = _profiles[i];
            if (profile.TotalSeconds <= 0)
            {
                continue;
            }

            Add(start + profile.AccelerationSeconds, null);
            if (!profile.IsTriangular)
            {
                Add(start + profile.TotalSeconds - profile.AccelerationSeconds, null);
            }

            Add(_segmentStartS[i + 1], _waypoints[i + 1]);
        }

        return knots;
    }

    private int Segment(double t)
    {
        if (t <= 0)
        {
            return 0;
        }

        var index = Array.BinarySearch(_segmentStartS, t);
        var segment = index >= 0 ? index : ~index - 1;
        return Math.Clamp(segment, 0, _profiles.Length - 1);
    }
}
