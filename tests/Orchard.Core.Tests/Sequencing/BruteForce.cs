using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// The independent oracle: every ordered choice of distinct non-start nodes of the right length, kept when
/// <see cref="TourProblem.FindViolation"/> accepts it. Exponential; for problems of up to 8 nodes.
/// </summary>
internal static class BruteForce
{
    public static long OptimalCost(TourProblem problem)
    {
        Assert.True(problem.NodeCount <= 8, "Brute force is for at most 8 nodes.");
        var others = Enumerable.Range(0, problem.NodeCount).Where(v => v != problem.Start).ToArray();
        var best = long.MaxValue;
        var sequence = new List<int> { problem.Start };
        var used = new bool[problem.NodeCount];

        void Extend()
        {
            if (sequence.Count == problem.TourLength)
            {
                if (problem.FindViolation(sequence) is null)
                {
                    best = Math.Min(best, problem.TourCost(sequence));
                }

                return;
            }

            foreach (var v in others)
            {
                if (!used[v])
                {
                    used[v] = true;
                    sequence.Add(v);
                    Extend();
                    sequence.RemoveAt(sequence.Count - 1);
                    used[v] = false;
                }
            }
        }

        Extend();
        Assert.NotEqual(long.MaxValue, best);
        return best;
    }
}
