using Orchard.Core.Geometry;
using Orchard.Core.Timing;

namespace Orchard.Core.Collision;

/// <summary>
/// Proves a timed trajectory (knots under <see cref="KnotContract"/>) free of collision between its knots, not
/// only at them. On an interval whose motion stays on the straight line between its knots the interval is
/// that edge, checked as any edge (conservative advancement). On a curved interval (a blend) each joint moves
/// as a parabola; over a sub-interval of h seconds it strays from the chord between the sub-interval's ends,
/// at the same instant, by at most |a_j|·h²/8, so every arm point strays by at most
/// δ = max over links of Σ_j R_jk·|a_j|·h²/8 (the arm model's motion bound). The sub-intervals are made short
/// enough that δ is below a tolerance, and each chord is checked with 2δ added to every margin (two links
/// may each stray by δ towards each other). A free chord then proves its piece of curve free.
/// </summary>
public static class TrajectoryCheck
{
    /// <summary>Each chord stands in for its curve within this much [0.5 mm].</summary>
    public const double DefaultDeviationM = 0.0005;

    /// <summary>Intervals (k, for the knots k and k+1) that are not proven free; empty when the whole trajectory is.</summary>
    /// <param name="toolIgnoreGroup">The limb the tool may touch on each interval (<see cref="CapsuleBvh.NoGroup"/> for none); null for none anywhere.</param>
    /// <param name="skipStraight">Skip intervals that run along a straight edge (already checked as part of the path).</param>
    public static List<int> BadIntervals(IReadOnlyList<TrajectoryPoint> knots, CollisionChecker checker, Func<int, int>? toolIgnoreGroup = null, bool skipStraight = false, double deviationM = DefaultDeviationM)
    {
        ArgumentNullException.ThrowIfNull(knots);
        ArgumentNullException.ThrowIfNull(checker);
        var bad = new List<int>();
        var n = checker.Arm.JointCount;
        var acceleration = new double[n];
        var spread = new double[n];
        var qa = new double[n];
        var qb = new double[n];
        var scratchV = new double[n];
        var scratchA = new double[n];
        for (var k = 0; k + 1 < knots.Count; k++)
        {
            var (a, b) = (knots[k], knots[k + 1]);
            var h = b.TimeS - a.TimeS;
            if (h <= 0)
            {
                continue;
            }

            for (var j = 0; j < n; j++)
            {
                acceleration[j] = (b.Velocities[j] - a.Velocities[j]) / h;
            }

            var straight = IsStraight(a, b, acceleration);
            if (straight && skipStraight)
            {
                continue;
            }

            var group = toolIgnoreGroup?.Invoke(k) ?? CapsuleBvh.NoGroup;
            var pieces = 1;
            var extra = 0.0;
            if (!straight)
            {
                for (var j = 0; j < n; j++)
                {
                    spread[j] = Math.Abs(acceleration[j]) * h * h / 8;
                }

                var whole = Deviation(checker.Arm, spread);
                pieces = Math.Max(1, (int)Math.Ceiling(Math.Sqrt(whole / deviationM)));
                extra = 2 * whole / (pieces * (double)pieces);
            }

            for (var p = 0; p < pieces; p++)
            {
                KnotContract.Sample(knots, a.TimeS + (h * p / pieces), qa, scratchV, scratchA);
                if (p == 0)
                {
                    a.Positions.ToArray().CopyTo(qa, 0);
                }

                KnotContract.Sample(knots, a.TimeS + (h * (p + 1) / pieces), qb, scratchV, scratchA);
                if (p == pieces - 1)
                {
                    b.Positions.ToArray().CopyTo(qb, 0);
                }

                if (!checker.IsEdgeFree(qa, qb, group, extra))
                {
                    bad.Add(k);
                    break;
                }
            }
        }

        return bad;
    }

    /// <summary>Largest distance any arm point can move when the joints move by the given amounts.</summary>
    private static double Deviation(ArmCollisionModel arm, double[] jointSpread)
    {
        var worst = 0.0;
        for (var link = 0; link <= arm.ToolLink; link++)
        {
            worst = Math.Max(worst, arm.MotionBoundM(jointSpread, link));
        }

        return worst;
    }

    /// <summary>Does the motion from a to b stay on the straight line between them (velocities and acceleration along the chord)?</summary>
    private static bool IsStraight(TrajectoryPoint a, TrajectoryPoint b, double[] acceleration)
    {
        var n = acceleration.Length;
        var chord = new double[n];
        var length = 0.0;
        for (var j = 0; j < n; j++)
        {
            chord[j] = b.Positions[j] - a.Positions[j];
            length += chord[j] * chord[j];
        }

        length = Math.Sqrt(length);
        if (length == 0)
        {
            return acceleration.All(x => x == 0) && a.Velocities.All(v => v == 0);
        }

        return Along(a.Velocities, chord, length) && Along(acceleration, chord, length);
    }

    private static bool Along(IReadOnlyList<double> x, double[] chord, double length)
    {
        // The part of x across the chord, component by component (no cancellation of squares).
        var dot = 0.0;
        var norm = 0.0;
        for (var j = 0; j < chord.Length; j++)
        {
            dot += x[j] * chord[j] / length;
            norm += x[j] * x[j];
        }

        var off = 0.0;
        for (var j = 0; j < chord.Length; j++)
        {
            var across = x[j] - (dot * chord[j] / length);
            off += across * across;
        }

        return Math.Sqrt(off) <= 1e-9 * (Math.Sqrt(norm) + 1e-12);
    }
}
