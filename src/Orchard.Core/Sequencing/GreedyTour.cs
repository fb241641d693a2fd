namespace Orchard.Core.Sequencing;

/// <summary>
/// Nearest feasible neighbour: from the start, repeatedly go to the cheapest node of a group that is not yet
/// visited and whose predecessors all are. Always feasible (the precedences are acyclic), O(n²). The
/// fallback when the routing search finds nothing, and a first route for it when there are precedences.
/// </summary>
internal static class GreedyTour
{
    public static int[] Build(TourProblem problem)
    {
        var sets = problem.VisitSets;
        var waitingFor = new int[sets.Count];
        var successors = new List<int>[sets.Count];
        for (var s = 0; s < sets.Count; s++)
        {
            successors[s] = [];
        }

        foreach (var p in problem.Precedences)
        {
            waitingFor[p.After]++;
            successors[p.Before].Add(p.After);
        }

        var done = new bool[sets.Count];
        var tour = new int[sets.Count + 1];
        tour[0] = problem.Start;
        var current = problem.Start;
        for (var step = 1; step <= sets.Count; step++)
        {
            var bestSet = -1;
            var bestNode = -1;
            var bestCost = long.MaxValue;
            for (var s = 0; s < sets.Count; s++)
            {
                if (done[s] || waitingFor[s] > 0)
                {
                    continue;
                }

                foreach (var node in sets[s])
                {
                    var c = problem.Cost(current, node);
                    if (c < bestCost || (c == bestCost && node < bestNode))
                    {
                        bestCost = c;
                        bestSet = s;
                        bestNode = node;
                    }
                }
            }

            done[bestSet] = true;
            foreach (var next in successors[bestSet])
            {
                waitingFor[next]--;
            }

            tour[step] = bestNode;
            current = bestNode;
        }

        return tour;
    }
}
