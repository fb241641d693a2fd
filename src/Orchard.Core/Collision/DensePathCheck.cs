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
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(checker);
        var bad = 0;
        var samples = 0;
        var n = checker.Arm.JointCount;
        var delta = new double[n];
        var q = new double[n];
        for (var s = 0; s + 1 < path.Count; s++)
        {
            var a = path[s];
            var b = path[s + 1];
            for (var j = 0; j < n; j++)
            {
                delta[j] = Math.Abs(b[j] - a[j]);
            }

            var bound = checker.Arm.MotionBoundM(delta, checker.Arm.ToolLink);
            for (var k = 0; k < checker.Arm.ToolLink; k++)
            {
                bound = Math.Max(bound, checker.Arm.MotionBoundM(delta, k));
            }

            var steps = Math.Max(1, (int)Math.Ceiling(bound / maxPointStepM));
            for (var i = s == 0 ? 0 : 1; i <= steps; i++)
            {
                var t = (double)i / steps;
                for (var j = 0; j < n; j++)
                {
                    q[j] = a[j] + ((b[j] - a[j]) * t);
                }

                samples++;
                if (!checker.IsFree(q, toolIgnoreGroup))
                {
                    bad++;
                }
            }
        }

        return (bad, samples);
    }
}
