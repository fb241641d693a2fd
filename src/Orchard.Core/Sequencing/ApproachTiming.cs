using Orchard.Core.Reachability;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Times a cut's straight approach: the tool moves from the clear pose to the cut along the approach axis with
/// a trapezoidal speed profile at the reduced approach speed, and never faster than the joints allow
/// for the same change of configuration. Each configuration of the approach path is stamped with the time
/// the profile reaches its station (distance from the clear pose); velocities at the
/// knots follow from the neighbouring knots. The retract is the same motion run backwards.
/// </summary>
public static class ApproachTiming
{
    public static (double Seconds, IReadOnlyList<TrajectoryPoint> Points) Time(CutCandidate candidate, JointSpeedLimits limits, double speedMS, double accelerationMS2)
    {
        ArgumentNullException.ThrowIfNull(candidate);
        return TimeLine(candidate.ApproachPath, candidate.ApproachStationsM, limits, speedMS, accelerationMS2);
    }

    /// <summary>Any straight tool line given as configurations and their stations (distance along the line from the first, increasing).</summary>
    public static (double Seconds, IReadOnlyList<TrajectoryPoint> Points) TimeLine(IReadOnlyList<double[]> path, IReadOnlyList<double> stations, JointSpeedLimits limits, double speedMS, double accelerationMS2)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(stations);
        ArgumentNullException.ThrowIfNull(limits);
        if (path.Count < 2)
        {
            return (0, path.Select(q => new TrajectoryPoint(0, q.ToArray(), new double[q.Length])).ToArray());
        }

        var distanceM = stations[^1];
        var cartesian = new TrapezoidalProfile(distanceM, speedMS, accelerationMS2);
        var joint = TimeParameterizer.StraightLineSeconds(path[0], path[^1], limits);
        var seconds = Math.Max(cartesian.TotalSeconds, joint);
        var stretch = cartesian.TotalSeconds > 0 ? seconds / cartesian.TotalSeconds : 1;

        var times = new double[path.Count];
        for (var i = 0; i < path.Count; i++)
        {
            times[i] = i == path.Count - 1 ? seconds : stretch * TimeAtDistance(cartesian, stations[i]);
        }

        var points = new TrajectoryPoint[path.Count];
        for (var i = 0; i < path.Count; i++)
        {
            var velocity = new double[path[i].Length];
            if (i > 0 && i < path.Count - 1)
            {
                var dt = times[i + 1] - times[i - 1];
                for (var j = 0; j < velocity.Length; j++)
                {
                    velocity[j] = dt > 0 ? (path[i + 1][j] - path[i - 1][j]) / dt : 0;
                }
            }

            points[i] = new TrajectoryPoint(times[i], path[i].ToArray(), velocity);
        }

        return (seconds, points);
    }

    /// <summary>Inverse of the profile's position, by bisection (it is monotone).</summary>
    private static double TimeAtDistance(in TrapezoidalProfile profile, double distance)
    {
        double low = 0, high = profile.TotalSeconds;
        for (var k = 0; k < 60; k++)
        {
            var mid = 0.5 * (low + high);
            if (profile.Position(mid) < distance)
            {
                low = mid;
            }
            else
            {
                high = mid;
            }
        }

        return high;
    }
}
