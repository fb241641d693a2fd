using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Orders one stop's cuts: a generalised TSP (one node per cut candidate, exactly one per cut, an open
/// path from the start node) over <see cref="ArcCostMatrix"/>, solved with OR-Tools routing, with lazy
/// evaluation of the arcs:
/// <list type="number">
/// <item>Every arc starts at its straight-line time within the joint limits (what the move costs when
/// nothing is in the way, and all that a free move costs).</item>
/// <item>Before the first solve, the straight line to each node's nearest candidates is probed: free is
/// exact at once (a direct move), blocked gets a guessed detour cost.</item>
/// <item>Each round solves; a tour arc not yet looked at is probed; only when the tour uses no unprobed
/// arc are its blocked arcs planned in full. The tour is final when it uses planned arcs only.</item>
/// </list>
/// All-pairs planning (every arc planned up front) stays selectable for comparison.
/// </summary>
internal static class LazyTourSearch
{
    public static (List<int> Order, int Rounds) Order(
        IReadOnlyList<TourNode> nodes,
        IReadOnlyList<IReadOnlyList<int>> groups,
        IReadOnlyList<GroupPrecedence> precedences,
        IReadOnlySet<int> retryFirst,
        IReadOnlySet<int> retryLast,
        MoveOracle oracle,
        Func<bool> pastDeadline,
        CancellationToken cancellationToken,
        IReadOnlyList<int>? initialVisits = null)
    {
        if (groups.Count == 0)
        {
            return ([0], 0);
        }

        var settings = oracle.Settings;
        var n = nodes.Count;
        var costs = new ArcCostMatrix(n);
        var failures = new SearchFailures(new int[n], new int[n]);
        for (var i = 0; i < n; i++)
        {
            for (var j = 1; j < n; j++)
            {
                if (i == j || nodes[i].CutIndex == nodes[j].CutIndex)
                {
                    continue;
                }

                if (oracle.TryCached(nodes[i], nodes[j], out var move))
                {
                    costs.MarkPlanned(i, j);
                    costs[i, j] = ArcMs(move, nodes[j]);
                }
                else
                {
                    costs[i, j] = ArcCostMatrix.Ms(TimeParameterizer.StraightLineSeconds(nodes[i].Configuration, nodes[j].Configuration, oracle.Limits) + nodes[j].ServiceSeconds);
                }
            }
        }

        if (settings.Mode == EvaluationMode.AllPairs)
        {
            var all = new List<(int, int)>();
            for (var i = 0; i < n; i++)
            {
                for (var j = 1; j < n; j++)
                {
                    if (i != j && nodes[i].CutIndex != nodes[j].CutIndex && !costs.IsPlanned(i, j))
                    {
                        all.Add((i, j));
                    }
                }
            }

            PlanArcs(all, nodes, costs, oracle, failures);
        }
        else if (settings.ProbeNeighbours > 0)
        {
            var nearest = new List<(int From, int To)>();
            for (var i = 0; i < n; i++)
            {
                nearest.AddRange(Enumerable.Range(1, n - 1)
                    .Where(j => j != i && nodes[j].CutIndex != nodes[i].CutIndex && !costs.IsPlanned(i, j))
                    .OrderBy(j => costs[i, j] - ArcCostMatrix.Ms(nodes[j].ServiceSeconds))
                    .ThenBy(j => j)
                    .Take(settings.ProbeNeighbours)
                    .Select(j => (i, j)));
            }

            ProbeArcs(nearest, nodes, costs, oracle);
        }

        // Rounds descend greedily from the previous round's tour (a warm start: one round's costs differ from
        // the last only on the arcs just looked at); a tour made of planned arcs only is then polished by greedy
        // descents from other first tours (cheapest insertions, savings), the best kept, and the rounds go on if
        // it uses arcs not yet looked at. Greedy descent stops at a local optimum, so every round is deterministic
        // without leaning on a time limit (guided local search, tried first, stalled on some trees until its 2 s
        // cap without reaching its solution limit).
        //
        // The best tour known for certain (every move planned and found) is kept: a round's tour, its guessed moves
        // planned, often comes out dearer than the guesses said, and the round at the cap is not always the best.
        // With LazyStopGain set, the rounds also end when the solver's next tour, guesses and all, promises less
        // than that fraction below it.
        var rounds = 0;
        var polishes = 0;
        var polishing = false;
        List<int>? previous = initialVisits?.ToList();
        List<int>? best = null;
        var bestCost = long.MaxValue;
        var restGivenUp = false;
        List<int> order;
        while (true)
        {
            cancellationToken.ThrowIfCancellationRequested();
            rounds++;
            var problem = new TourProblem(costs.WithPenalties(retryFirst, retryLast), 0, TourKind.Open, groups, precedences);
            if (previous is not null && IsSettled(previous, costs) && problem.FindViolation(previous) is null && problem.TourCost(previous) < bestCost)
            {
                (best, bestCost) = (previous, problem.TourCost(previous));
            }

            var solveStart = oracle.Clock.GetTimestamp();
            var descent = new TourSolverSettings(TimeLimit: settings.SolverTimeCap, Search: TourSearch.GreedyDescent, InitialVisits: previous);
            var solution = TourSolver.Solve(problem, descent, cancellationToken);
            if (polishing)
            {
                foreach (var first in PolishStarts)
                {
                    var other = TourSolver.Solve(problem, descent with { FirstSolution = first, InitialVisits = null }, cancellationToken);
                    if (other.TotalCost < solution.TotalCost)
                    {
                        solution = other;
                    }
                }
            }

            var solveSeconds = oracle.Clock.GetElapsedTime(solveStart).TotalSeconds;
            oracle.SolverSeconds += solveSeconds;
            order = solution.Visits.ToList();
            var unprobed = new List<(int, int)>();
            var guessed = new List<(int, int)>();
            for (var k = 0; k + 1 < order.Count; k++)
            {
                var (i, j) = (order[k], order[k + 1]);
                if (!costs.IsPlanned(i, j))
                {
                    (costs.IsProbed(i, j) ? guessed : unprobed).Add((i, j));
                }
            }

            settings.Trace?.Invoke($"{oracle.StandKey} round {rounds}: tour {order.Count}, cost {solution.TotalCost} (best planned {(best is null ? "none" : bestCost)}), unprobed {unprobed.Count}, guessed {guessed.Count}, solved in {solveSeconds * 1000:F0} ms ({solution.Statistics})");
            previous = order;
            if (unprobed.Count == 0 && guessed.Count == 0)
            {
                if (polishing || polishes >= settings.MaxPolishRounds)
                {
                    order = Better(order, best, bestCost, problem);
                    break;
                }

                polishing = true;
                polishes++;
                continue;
            }

            polishing = false;

            if (best is not null && settings.LazyStopGain is { } gain && solution.TotalCost >= bestCost * (1 - gain))
            {
                settings.Trace?.Invoke($"{oracle.StandKey} round {rounds}: promises {solution.TotalCost}, not {gain:P1} below the best planned {bestCost}; kept");
                order = best;
                break;
            }

            if (!restGivenUp && settings.MaxFailedSearches > 0 && failures.Into.Sum() >= Math.Max(settings.MaxFailedSearches, groups.Count))
            {
                // Enough searches failed here: no more. Every move not planned yet counts as unplannable, and the
                // rounds settle the best tour of the moves found (a cut it cannot reach goes to another stop).
                GiveUpUnplanned(nodes, costs);
                restGivenUp = true;
                continue;
            }

            if (rounds >= settings.MaxLazyRounds || pastDeadline())
            {
                PlanArcs([.. unprobed, .. guessed], nodes, costs, oracle, failures);
                order = Better(order, best, bestCost, new TourProblem(costs.WithPenalties(retryFirst, retryLast), 0, TourKind.Open, groups, precedences));
                break;
            }

            if (unprobed.Count > 0 && settings.ProbeNeighbours > 0 && rounds == settings.ProbeAllAfterRounds)
            {
                // Still finding moves not looked at: rather than one round per handful, probe every move left
                // (one edge check each) and let the rounds settle the blocked ones.
                var rest = new List<(int, int)>();
                for (var i = 0; i < n; i++)
                {
                    for (var j = 1; j < n; j++)
                    {
                        if (i != j && nodes[i].CutIndex != nodes[j].CutIndex && !costs.IsProbed(i, j) && !costs.IsPlanned(i, j))
                        {
                            rest.Add((i, j));
                        }
                    }
                }

                ProbeArcs(rest, nodes, costs, oracle);
            }
            else if (unprobed.Count > 0 && settings.ProbeNeighbours > 0)
            {
                // Probe around the tour too: the moves it would switch to next are near the ones it uses.
                var around = unprobed.ToHashSet();
                foreach (var i in order)
                {
                    foreach (var j in Enumerable.Range(1, n - 1)
                        .Where(j => j != i && nodes[j].CutIndex != nodes[i].CutIndex && !costs.IsProbed(i, j) && !costs.IsPlanned(i, j))
                        .OrderBy(j => costs[i, j] - ArcCostMatrix.Ms(nodes[j].ServiceSeconds))
                        .ThenBy(j => j)
                        .Take(settings.ProbeAroundTour))
                    {
                        around.Add((i, j));
                    }
                }

                ProbeArcs(around.OrderBy(a => a.Item1).ThenBy(a => a.Item2).ToList(), nodes, costs, oracle);
            }
            else
            {
                PlanArcs([.. unprobed, .. guessed], nodes, costs, oracle, failures);
            }
        }

        return (order, rounds);
    }

    /// <summary>Whether every move of <paramref name="order"/> is planned and was found.</summary>
    private static bool IsSettled(List<int> order, ArcCostMatrix costs)
    {
        for (var k = 0; k + 1 < order.Count; k++)
        {
            if (!costs.IsPlanned(order[k], order[k + 1]) || costs[order[k], order[k + 1]] >= ArcCostMatrix.UnplannableMs)
            {
                return false;
            }
        }

        return true;
    }

    /// <summary><paramref name="order"/>, or the best settled tour when that costs less in <paramref name="problem"/> (ties keep the order).</summary>
    private static List<int> Better(List<int> order, List<int>? best, long bestCost, TourProblem problem) =>
        best is not null && bestCost < problem.TourCost(order) ? best : order;

    /// <summary>Other first tours a converged tour is compared with.</summary>
    private static readonly TourFirstSolutionStrategy[] PolishStarts =
        [TourFirstSolutionStrategy.LocalCheapestInsertion, TourFirstSolutionStrategy.ParallelCheapestInsertion, TourFirstSolutionStrategy.Savings];

    /// <summary>
    /// Checks only the straight line of each move: a free one is an exact, planned (direct) move at
    /// once; a blocked one gets a guessed detour cost (<see cref="SequencingSettings.BlockedGuessFactor"/>
    /// × its straight-line time) until the tour needs it and it is planned in full. One edge check each.
    /// </summary>
    private static void ProbeArcs(List<(int From, int To)> arcs, IReadOnlyList<TourNode> nodes, ArcCostMatrix costs, MoveOracle oracle)
    {
        var free = new bool[arcs.Count];
        var probeStart = oracle.Clock.GetTimestamp();
        Parallel.For(0, arcs.Count, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, oracle.Settings.Parallelism), CancellationToken = oracle.CancellationToken }, k =>
        {
            free[k] = oracle.ProbeStraight(nodes[arcs[k].From], nodes[arcs[k].To]);
        });
        oracle.MoveSeconds += oracle.Clock.GetElapsedTime(probeStart).TotalSeconds;

        for (var k = 0; k < arcs.Count; k++)
        {
            var (i, j) = arcs[k];
            costs.MarkProbed(i, j);
            if (free[k])
            {
                costs.MarkPlanned(i, j);
                oracle.TryCached(nodes[i], nodes[j], out var move);
                costs[i, j] = ArcMs(move!, nodes[j]);
            }
            else
            {
                var straight = TimeParameterizer.StraightLineSeconds(nodes[i].Configuration, nodes[j].Configuration, oracle.Limits);
                costs[i, j] = ArcCostMatrix.Ms((oracle.Settings.BlockedGuessFactor * straight) + nodes[j].ServiceSeconds);
            }
        }
    }

    /// <summary>
    /// Plans the moves in full. A move the planners do not find is joined through a third pose with found
    /// moves both ways, the cheapest such (<see cref="MoveOracle.Join"/>), when <see cref="SequencingSettings.JoinFailedMoves"/>;
    /// and a move to (from) a pose whose moves to (from) it failed <see cref="SequencingSettings.SearchesBeforeJoining"/>
    /// times is joined at once when it can be, without another search: such a pose sits in a pocket of the
    /// wood, and every failed search spends both planners' whole budgets.
    /// </summary>
    private static void PlanArcs(List<(int From, int To)> arcs, IReadOnlyList<TourNode> nodes, ArcCostMatrix costs, MoveOracle oracle, SearchFailures failures)
    {
        var settings = oracle.Settings;
        var pocket = settings.JoinFailedMoves && settings.SearchesBeforeJoining > 0;
        var joinAtOnce = arcs.Select(a => pocket
            && (failures.Into[a.To] >= settings.SearchesBeforeJoining || failures.From[a.From] >= settings.SearchesBeforeJoining)
            && BestVia(a.From, a.To, nodes, costs) >= 0).ToArray();
        var search = Enumerable.Range(0, arcs.Count).Where(k => !joinAtOnce[k]).ToArray();
        var moves = new PlannedMove[arcs.Count];
        var planStart = oracle.Clock.GetTimestamp();
        Parallel.For(0, search.Length, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, settings.Parallelism), CancellationToken = oracle.CancellationToken }, s =>
        {
            var k = search[s];
            moves[k] = oracle.Get(nodes[arcs[k].From], nodes[arcs[k].To]);
        });

        foreach (var k in search)
        {
            var (i, j) = arcs[k];
            costs.MarkPlanned(i, j);
            costs[i, j] = ArcMs(moves[k], nodes[j]);
            if (!moves[k].Success)
            {
                failures.Into[j]++;
                failures.From[i]++;
            }
        }

        // In the arcs' order, one after another: each join may go through a move joined before it.
        if (settings.JoinFailedMoves)
        {
            for (var k = 0; k < arcs.Count; k++)
            {
                var (i, j) = arcs[k];
                if ((joinAtOnce[k] || !moves[k].Success) && BestVia(i, j, nodes, costs) is var via and >= 0)
                {
                    costs.MarkPlanned(i, j);
                    costs[i, j] = ArcMs(oracle.Join(nodes[i], nodes[via], nodes[j]), nodes[j]);
                }
                else if (joinAtOnce[k])
                {
                    throw new InvalidOperationException("A way through another pose disappeared while joining; moves found stay found.");
                }
            }
        }

        oracle.MoveSeconds += oracle.Clock.GetElapsedTime(planStart).TotalSeconds;

        var giveUpAfter = settings.GiveUpAfterFailedMoves;
        if (giveUpAfter > 0)
        {
            foreach (var v in arcs.Where((a, k) => costs[a.From, a.To] >= ArcCostMatrix.UnplannableMs).SelectMany(a => new[] { a.From, a.To }).Distinct().Order())
            {
                GiveUpIfTrapped(v, giveUpAfter, nodes, costs);
            }
        }
    }

    /// <summary>
    /// The pose the cheapest way from node <paramref name="from"/> to <paramref name="to"/> through one other
    /// goes by, over moves found (time to it without its cut, then on); −1 when there is none. Never the start,
    /// which no move returns to.
    /// </summary>
    internal static int BestVia(int from, int to, IReadOnlyList<TourNode> nodes, ArcCostMatrix costs)
    {
        var best = -1;
        var bestMs = long.MaxValue;
        for (var a = 1; a < nodes.Count; a++)
        {
            if (a == from || a == to || !Found(from, a) || !Found(a, to))
            {
                continue;
            }

            var ms = costs[from, a] - ArcCostMatrix.Ms(nodes[a].ServiceSeconds) + costs[a, to];
            if (ms < bestMs)
            {
                (best, bestMs) = (a, ms);
            }
        }

        return best;

        bool Found(int i, int j) => costs.IsPlanned(i, j) && costs[i, j] < ArcCostMatrix.UnplannableMs;
    }

    /// <summary>Failed searches so far, by the pose they went to and the pose they left.</summary>
    private sealed record SearchFailures(int[] Into, int[] From);

    /// <summary>
    /// Node <paramref name="v"/> (a pre-cut pose; never the start) with at least <paramref name="failedAtLeast"/>
    /// failed planned moves and no move found to or from it: its moves not yet planned count as unplannable.
    /// </summary>
    internal static void GiveUpIfTrapped(int v, int failedAtLeast, IReadOnlyList<TourNode> nodes, ArcCostMatrix costs)
    {
        if (v == 0)
        {
            return;
        }

        var failed = 0;
        for (var u = 0; u < nodes.Count; u++)
        {
            foreach (var (a, b) in new[] { (u, v), (v, u) })
            {
                if (u == v || !costs.IsPlanned(a, b))
                {
                    continue;
                }

                if (costs[a, b] < ArcCostMatrix.UnplannableMs)
                {
                    return;
                }

                // Only moves planned and failed count, not those settled by giving up a neighbour (no cascade).
                failed += costs[a, b] == ArcCostMatrix.UnplannableMs ? 1 : 0;
            }
        }

        if (failed < failedAtLeast)
        {
            return;
        }

        for (var u = 0; u < nodes.Count; u++)
        {
            foreach (var (a, b) in new[] { (u, v), (v, u) })
            {
                if (u != v && b != 0 && nodes[a].CutIndex != nodes[b].CutIndex && !costs.IsPlanned(a, b))
                {
                    costs.MarkProbed(a, b);
                    costs.MarkPlanned(a, b);
                    costs[a, b] = GivenUpMs;
                }
            }
        }
    }

    /// <summary>Every move not planned yet (never one into the start or within a cut) counts as unplannable, as given up.</summary>
    private static void GiveUpUnplanned(IReadOnlyList<TourNode> nodes, ArcCostMatrix costs)
    {
        for (var i = 0; i < nodes.Count; i++)
        {
            for (var j = 1; j < nodes.Count; j++)
            {
                if (i != j && nodes[i].CutIndex != nodes[j].CutIndex && !costs.IsPlanned(i, j))
                {
                    costs.MarkProbed(i, j);
                    costs.MarkPlanned(i, j);
                    costs[i, j] = GivenUpMs;
                }
            }
        }
    }

    /// <summary>The cost of a move settled as unplannable by giving up a pose: as unplannable, told apart from a failure.</summary>
    internal const long GivenUpMs = ArcCostMatrix.UnplannableMs + 1;

    private static long ArcMs(PlannedMove move, TourNode to) => move.Success ? ArcCostMatrix.Ms(move.DurationS + to.ServiceSeconds) : ArcCostMatrix.UnplannableMs;
}
