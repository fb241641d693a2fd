using Orchard.Core.Reachability;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Times a cut's straight approach: the tool moves the stand-off distance along the approach axis with
/// a trapezoidal speed profile at the reduced approach speed, and never faster than the joints allow
/// for the same change of configuration. The approach path's configurations are equally spaced along
/// the line, so each is stamped with the time the profile reaches its distance; velocities at the
/// knots follow from the neighbouring knots. The retract is the same motion run backwards.
/// </summary>
public static class ApproachTiming
{
    public static (double Seconds, IReadOnlyList<TrajectoryPoint> Points) Time(CutCandidate candidate, double standOffM, JointSpeedLimits limits, double speedMS, double accelerationMS2)
    {
        ArgumentNullException.ThrowIfNull(candidate);
        ArgumentNullException.ThrowIfNull(limits);
        var path = candidate.ApproachPath;
        var cartesian = new TrapezoidalProfile(standOffM, speedMS, accelerationMS2);
        var joint = TimeParameterizer.StraightLineSeconds(path[0], path[^1], limits);
        var seconds = Math.Max(cartesian.TotalSeconds, joint);
        var stretch = cartesian.TotalSeconds > 0 ? seconds / cartesian.TotalSeconds : 1;

        var times = new double[path.Count];
        for (var i = 0; i < path.Count; i++)
        {
            times[i] = i == path.Count - 1 ? seconds : stretch * TimeAtDistance(cartesian, standOffM * i / (path.Count - 1));
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
