namespace Orchard.Core.Sequencing;

/// <summary>
/// Exact dynamic programme over subsets (Held and Karp, "A dynamic programming approach to sequencing
/// problems", J. SIAM 10(1):196–210, 1962): the cheapest path from the start through exactly the node set S
/// ending at j, for every S and j, in O(2^m · m²) time for m nodes besides the start. Extended here, as the
/// recursion allows, to groups (a node may join S only when no other node of its group is in S; a tour is
/// complete when S holds one node of every group) and to group precedences (a node may join S only when a
/// node of each preceding group already is). For tests and small instances: at most
/// <see cref="MaxNodeCount"/> nodes.
/// </summary>
public static class HeldKarp
{
    /// <summary>Most nodes (the start included): 2^15 subsets × 15 ends, about 4 MB of table.</summary>
    public const int MaxNodeCount = 16;

    public static TourSolution Solve(TourProblem problem, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(problem);
        if (problem.NodeCount > MaxNodeCount)
        {
            throw new ArgumentException($"Held–Karp takes at most {MaxNodeCount} nodes; this problem has {problem.NodeCount}.", nameof(problem));
        }

        cancellationToken.ThrowIfCancellationRequested();
        var start = problem.Start;
        var nodes = Enumerable.Range(0, problem.NodeCount).Where(v => v != start).ToArray();
        var m = nodes.Length;
        var setCount = problem.VisitSets.Count;
        if (m == 0)
        {
            return Result(problem, [start]);
        }

        var setBit = nodes.Select(v => 1 << problem.VisitSetOf(v)).ToArray();
        var mustPrecede = new int[setCount];
        foreach (var p in problem.Precedences)
        {
            mustPrecede[p.After] |= 1 << p.Before;
        }

        var subsetCount = 1 << m;
        var covered = new int[subsetCount];
        for (var mask = 1; mask < subsetCount; mask++)
        {
            var low = System.Numerics.BitOperations.TrailingZeroCount(mask);
            covered[mask] = covered[mask & (mask - 1)] | setBit[low];
        }

        var cost = new long[subsetCount * m];
        var parent = new sbyte[subsetCount * m];
        Array.Fill(cost, long.MaxValue);
        for (var j = 0; j < m; j++)
        {
            if (mustPrecede[problem.VisitSetOf(nodes[j])] == 0)
            {
                cost[((1 << j) * m) + j] = problem.Cost(start, nodes[j]);
                parent[((1 << j) * m) + j] = -1;
            }
        }

        // Supersets have larger masks, so ascending order finishes every subset before it is extended.
        for (var mask = 1; mask < subsetCount; mask++)
        {
            if ((mask & 0x3FF) == 0)
            {
                cancellationToken.ThrowIfCancellationRequested();
            }

            var have = covered[mask];
            for (var j = 0; j < m; j++)
            {
                var here = cost[(mask * m) + j];
                if (here == long.MaxValue)
                {
                    continue;
                }

                for (var k = 0; k < m; k++)
                {
                    if ((mask & (1 << k)) != 0 || (have & setBit[k]) != 0)
                    {
                        continue;
                    }

                    if ((mustPrecede[problem.VisitSetOf(nodes[k])] & ~have) != 0)
                    {
                        continue;
                    }

                    var next = mask | (1 << k);
                    var candidate = here + problem.Cost(nodes[j], nodes[k]);
                    if (candidate < cost[(next * m) + k])
                    {
                        cost[(next * m) + k] = candidate;
                        parent[(next * m) + k] = (sbyte)j;
                    }
                }
            }
        }

        var all = (1 << setCount) - 1;
        var bestCost = long.MaxValue;
        var bestMask = -1;
        var bestEnd = -1;
        for (var mask = 1; mask < subsetCount; mask++)
        {
            if (covered[mask] != all)
            {
                continue;
            }

            for (var j = 0; j < m; j++)
            {
                var here = cost[(mask * m) + j];
                if (here == long.MaxValue)
                {
                    continue;
                }

                var total = here + (problem.Kind == TourKind.Closed ? problem.Cost(nodes[j], start) : 0);
                if (total < bestCost)
                {
                    bestCost = total;
                    bestMask = mask;
                    bestEnd = j;
                }
            }
        }

        // Acyclic precedences always leave a feasible order, so a best tour exists.
        var reversed = new List<int>();
        for (int mask = bestMask, j = bestEnd; j >= 0;)
        {
            reversed.Add(nodes[j]);
            var previous = parent[(mask * m) + j];
            mask &= ~(1 << j);
            j = previous;
        }

        reversed.Add(start);
        reversed.Reverse();
        return Result(problem, reversed);
    }

    private static TourSolution Result(TourProblem problem, IReadOnlyList<int> visits) =>
        new(visits, problem.TourCost(visits), TourStatus.Optimal, new TourSolverStatistics(TourEngine.HeldKarp, 1, false, null));
}
