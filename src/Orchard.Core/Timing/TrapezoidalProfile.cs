namespace Orchard.Core.Timing;

/// <summary>
/// The fastest rest-to-rest motion over a distance h ≥ 0 under a speed limit v and an acceleration
/// limit a: accelerate at a, cruise at v, decelerate at a (trapezoidal velocity), or, when the distance
/// is too short to reach v (h &lt; v²/a), accelerate then decelerate at a (triangular, peak √(a·h)).
/// Durations (Biagiotti and Melchiorri, "Trajectory Planning for Automatic Machines and Robots",
/// Springer 2008, §3.2.2; the same forms are in Siciliano et al., "Robotics: Modelling, Planning and
/// Control", Springer 2009, §4.2.1):
///   trapezoidal: T = h/v + v/a, acceleration phase Ta = v/a;
///   triangular:  T = 2·√(h/a), Ta = T/2.
/// </summary>
public readonly struct TrapezoidalProfile
{
    public TrapezoidalProfile(double distance, double maxVelocity, double maxAcceleration)
    {
        if (!(distance >= 0) || !(maxVelocity > 0) || !(maxAcceleration > 0))
        {
            throw new ArgumentOutOfRangeException(nameof(distance), "Needs distance ≥ 0 and positive limits.");
        }

        Distance = distance;
        Acceleration = maxAcceleration;
        if (distance * maxAcceleration >= maxVelocity * maxVelocity)
        {
            PeakVelocity = maxVelocity;
            AccelerationSeconds = maxVelocity / maxAcceleration;
            TotalSeconds = (distance / maxVelocity) + AccelerationSeconds;
        }
        else
        {
            PeakVelocity = Math.Sqrt(distance * maxAcceleration);
            AccelerationSeconds = PeakVelocity / maxAcceleration;
            TotalSeconds = 2 * AccelerationSeconds;
        }
    }

    public double Distance { get; }

    public double Acceleration { get; }

    public double PeakVelocity { get; }

    /// <summary>Length of the acceleration phase (and of the deceleration phase).</summary>
    public double AccelerationSeconds { get; }

    public double CruiseSeconds => TotalSeconds - (2 * AccelerationSeconds);

    public double TotalSeconds { get; }

    public bool IsTriangular => CruiseSeconds <= 1e-15;

    /// <summary>Distance covered at time t (clamped to [0, T]).</summary>
    public double Position(double t)
    {
        if (t <= 0)
        {
            return 0;
        }

        if (t >= TotalSeconds)
        {
            return Distance;
        }

        var ta = AccelerationSeconds;
        if (t < ta)
        {
            return 0.5 * Acceleration * t * t;
        }

        var accelDistance = 0.5 * Acceleration * ta * ta;
        if (t <= TotalSeconds - ta)
        {
            return accelDistance + (PeakVelocity * (t - ta));
        }

        var remaining = TotalSeconds - t;
        return Distance - (0.5 * Acceleration * remaining * remaining);
    }

    public double Velocity(double t)
    {
        if (t <= 0 || t >= TotalSeconds)
        {
            return 0;
        }

        var ta = AccelerationSeconds;
        if (t < ta)
        {
            return Acceleration * t;
        }

        return t <= TotalSeconds - ta ? PeakVelocity : Acceleration * (TotalSeconds - t);
    }

    public double AccelerationAt(double t)
    {
        if (t <= 0 || t >= TotalSeconds)
        {
            return 0;
        }

        var ta = AccelerationSeconds;
        if (t < ta)
        {
            return Acceleration;
        }

        return t <= TotalSeconds - ta ? 0 : -Acceleration;
    }
}
