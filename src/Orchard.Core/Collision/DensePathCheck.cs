using Orchard.Core.Timing;

namespace Orchard.Core.Collision;

/// <summary>
/// An independent re-check of a joint path by dense sampling: every segment is cut into steps short
/// enough that no point of the arm moves more than <see cref="MaxPointStepM"/> between samples (by the
/// arm model's motion bound), and every sample must pass the plain configuration check. It shares the
/// configuration check with the planners but not their edge method (conservative advancement), so it
/// catches a wrong step bound or a skipped segment.
/// </summary>
public static class DensePathCheck
{
    /// <summary>Largest movement of any arm point between two samples [2 mm].</summary>
    public const double MaxPointStepM = 0.002;

    /// <summary>Samples that are not free (0 for a good path), and the number of samples checked.</summary>
    public static (int Bad, int Samples) Count(IReadOnlyList<double[]> path, CollisionChecker checker, int toolIgnoreGroup = -1, double maxPointStepM = MaxPointStepM)
    {
        ArgumentNullException.ThrowIfNull(checker);
        var bad = 0;
        var samples = 0;
        foreach (var q in PathSampling.Samples(path, checker.Arm, maxPointStepM))
        {
            samples++;
            if (!checker.IsFree(q, toolIgnoreGroup))
            {
                bad++;
            }
        }

        return (bad, samples);
    }

    /// <summary>
    /// The same for a timed trajectory: the motion its knots define (<see cref="KnotContract"/>), sampled so
    /// that no arm point moves more than <paramref name="maxPointStepM"/> between samples (joint velocities
    /// change linearly between knots, so their largest magnitude on an interval is at one of its ends, and the
    /// motion bound turns them into a bound on every arm point's speed).
    /// </summary>
    /// <param name="toolIgnoreGroupAt">The limb the tool may touch at a time; null for none.</param>
    public static (int Bad, int Samples) CountTrajectory(IReadOnlyList<TrajectoryPoint> knots, CollisionChecker checker, Func<double, int>? toolIgnoreGroupAt = null, double maxPointStepM = MaxPointStepM)
    {
        ArgumentNullException.ThrowIfNull(knots);
        ArgumentNullException.ThrowIfNull(checker);
        if (knots.Count == 0)
        {
            return (0, 0);
        }

        var n = checker.Arm.JointCount;
        var (q, v, a) = (new double[n], new double[n], new double[n]);
        var speed = new double[n];
        int bad = 0, samples = 0;
        void Check(double t)
        {
            KnotContract.Sample(knots, t, q, v, a);
            samples++;
            if (!checker.IsFree(q, toolIgnoreGroupAt?.Invoke(t) ?? -1))
            {
                bad++;
            }
        }

        Check(knots[0].TimeS);
        for (var k = 0; k + 1 < knots.Count; k++)
        {
            var h = knots[k + 1].TimeS - knots[k].TimeS;
            for (var j = 0; j < n; j++)
            {
                speed[j] = Math.Max(Math.Abs(knots[k].Velocities[j]), Math.Abs(knots[k + 1].Velocities[j]));
            }

            var bound = 0.0;
            for (var link = 0; link <= checker.Arm.ToolLink; link++)
            {
                bound = Math.Max(bound, checker.Arm.MotionBoundM(speed, link));
            }

            var count = Math.Max(1, (int)Math.Ceiling(bound * h / maxPointStepM));
            for (var i = 1; i <= count; i++)
            {
                // The interval's last sample is its end knot itself: t_k + h·count/count can fall an ulp short of
                // t_{k+1}, and the parabola evaluated there lands a rounding error off the knot (past a joint limit
                // when the knot sits on one, as stow's lift at 0 m does).
                Check(i == count ? knots[k + 1].TimeS : knots[k].TimeS + (h * i / count));
            }
        }

        return (bad, samples);
    }
}
