using Orchard.Core.Randomness;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>Seeded random instances for the exact comparisons.</summary>
internal static class RandomProblems
{
    /// <summary>Independent uniform costs in [1, maxCost] for every ordered pair: asymmetric, not metric.</summary>
    public static long[][] AsymmetricCosts(DeterministicRandom random, int n, int maxCost = 1000)
    {
        var costs = new long[n][];
        for (var i = 0; i < n; i++)
        {
            costs[i] = new long[n];
            for (var j = 0; j < n; j++)
            {
                costs[i][j] = i == j ? 0 : random.NextInt(1, maxCost + 1);
            }
        }

        return costs;
    }

    /// <summary>Every non-start node in a group of its own (so precedences can name it), in node order.</summary>
    public static int[][] Singletons(int n, int start) =>
        [.. Enumerable.Range(0, n).Where(v => v != start).Select(v => new[] { v })];

    /// <summary>
    /// Random precedences that form a DAG: groups are put in a random order and each pair (earlier, later)
    /// becomes a precedence with the given probability.
    /// </summary>
    public static GroupPrecedence[] RandomDag(DeterministicRandom random, int groupCount, double probability)
    {
        var order = Shuffled(random, groupCount);
        var precedences = new List<GroupPrecedence>();
        for (var a = 0; a < groupCount; a++)
        {
            for (var b = a + 1; b < groupCount; b++)
            {
                if (random.NextBool(probability))
                {
                    precedences.Add(new GroupPrecedence(order[a], order[b]));
                }
            }
        }

        return [.. precedences];
    }

    /// <summary>Non-start nodes dealt at random into groups of 1 to maxSize alternatives.</summary>
    public static int[][] RandomGroups(DeterministicRandom random, int n, int start, int maxSize)
    {
        var nodes = Shuffled(random, n).Where(v => v != start).ToList();
        var groups = new List<int[]>();
        var at = 0;
        while (at < nodes.Count)
        {
            var size = Math.Min(random.NextInt(1, maxSize + 1), nodes.Count - at);
            groups.Add([.. nodes.GetRange(at, size)]);
            at += size;
        }

        return [.. groups];
    }

    public static int[] Shuffled(DeterministicRandom random, int n)
    {
        var items = Enumerable.Range(0, n).ToArray();
        for (var i = n - 1; i > 0; i--)
        {
            var j = random.NextInt(i + 1);
            (items[i], items[j]) = (items[j], items[i]);
        }

        return items;
    }
}
