using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Collision;

/// <summary>Straight joint-space segments, as the edge checks interpolate them.</summary>
internal static class JointSpace
{
    /// <summary>from + t·(to − from).</summary>
    public static double[] Lerp(ReadOnlySpan<double> from, ReadOnlySpan<double> to, double t)
    {
        var q = new double[from.Length];
        for (var j = 0; j < q.Length; j++)
        {
            q[j] = from[j] + (t * (to[j] - from[j]));
        }

        return q;
    }

    /// <summary>q moved by <paramref name="length"/> (joint units) in a random joint-space direction, clamped into the limits.</summary>
    public static double[] Step(DeterministicRandom random, KinematicChain chain, ReadOnlySpan<double> q, double length)
    {
        var direction = new double[q.Length];
        var norm = 0.0;
        for (var j = 0; j < q.Length; j++)
        {
            direction[j] = random.NextGaussian();
            norm += direction[j] * direction[j];
        }

        norm = Math.Sqrt(norm);
        var to = new double[q.Length];
        for (var j = 0; j < q.Length; j++)
        {
            to[j] = Math.Clamp(q[j] + (length * direction[j] / norm), chain.LowerLimits[j], chain.UpperLimits[j]);
        }

        return to;
    }

    /// <summary>
    /// q with one revolute joint turned by ±<paramref name="angleRad"/>, clamped into its limits: the motion in which
    /// points far from that joint's axis move at close to the motion bound.
    /// </summary>
    public static double[] TurnOneJoint(DeterministicRandom random, KinematicChain chain, ReadOnlySpan<double> q, double angleRad)
    {
        var revolute = new List<int>();
        for (var j = 0; j < chain.JointCount; j++)
        {
            if (chain.JointKinds[j] == Orchard.Core.Model.JointKind.Revolute)
            {
                revolute.Add(j);
            }
        }

        var joint = revolute[random.NextInt(revolute.Count)];
        var to = q.ToArray();
        to[joint] = Math.Clamp(q[joint] + (random.NextBool(0.5) ? angleRad : -angleRad), chain.LowerLimits[joint], chain.UpperLimits[joint]);
        return to;
    }
}
