using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// An arm's joint space: the chain's joint limits, the Euclidean metric in joint units, straight interpolation, and
/// travel times from the joints' speed and acceleration limits.
/// </summary>
public sealed class JointConfigurationSpace(KinematicChain chain) : IConfigurationSpace
{
    private readonly KinematicChain _chain = chain ?? throw new ArgumentNullException(nameof(chain));

    public int Dimension => _chain.JointCount;

    public ReadOnlySpan<double> LowerLimits => _chain.LowerLimits;

    public ReadOnlySpan<double> UpperLimits => _chain.UpperLimits;

    public double Distance(ReadOnlySpan<double> a, ReadOnlySpan<double> b) => JointSpace.Distance(a, b);

    public double[] Interpolate(ReadOnlySpan<double> a, ReadOnlySpan<double> b, double t) => JointSpace.Lerp(a, b, t);

    /// <summary>
    /// The slowest joint's rest-to-rest time over its share of the edge: a triangle profile, 2·√(d/a), while the joint
    /// cannot reach its speed limit (d ≤ v²/a), else a trapezoid, d/v + v/a.
    /// </summary>
    public double TravelTimeS(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var speeds = _chain.MaxVelocities;
        var accelerations = _chain.MaxAccelerations;
        var slowest = 0.0;
        for (var j = 0; j < a.Length; j++)
        {
            var d = Math.Abs(b[j] - a[j]);
            var (v, acc) = (speeds[j], accelerations[j]);
            var t = d * acc <= v * v ? 2 * Math.Sqrt(d / acc) : (d / v) + (v / acc);
            slowest = Math.Max(slowest, t);
        }

        return slowest;
    }

    public double[] SampleUniform(DeterministicRandom random)
    {
        ArgumentNullException.ThrowIfNull(random);
        var q = new double[Dimension];
        for (var j = 0; j < q.Length; j++)
        {
            q[j] = random.NextDouble(_chain.LowerLimits[j], _chain.UpperLimits[j]);
        }

        return q;
    }

    public void Clamp(Span<double> q)
    {
        for (var j = 0; j < q.Length; j++)
        {
            q[j] = Math.Clamp(q[j], _chain.LowerLimits[j], _chain.UpperLimits[j]);
        }
    }
}
