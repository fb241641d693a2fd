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
}
