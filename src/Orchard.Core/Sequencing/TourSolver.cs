using Google.OrTools.ConstraintSolver;
using Google.Protobuf.WellKnownTypes;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Solves a <see cref="TourProblem"/> with the OR-Tools routing solver, one vehicle:
/// <list type="bullet">
/// <item>closed tours start and end at the start node; open paths end at an added dummy node that every
/// node reaches at zero cost, so the last real visit is free to be anywhere;</item>
/// <item>each group of two or more alternatives is a mandatory disjunction (no penalty, so exactly one of
/// its nodes is active);</item>
/// <item>precedences use a counting dimension (transit 1 per arc, so a node's cumul is its position) and,
/// per group, rank = Σ cumul(a)·active(a) over its nodes, which is the position of the one visited node;
/// then rank(before) &lt; rank(after) is posted on the underlying constraint solver. Such a search starts
/// from the greedy feasible tour, since the first-solution heuristics do not see these constraints;</item>
/// <item>a first solution by <see cref="TourSolverSettings.FirstSolution"/>, improved by guided local search
/// until the time or solution limit.</item>
/// </list>
/// Problems with at most one visit besides the start are answered directly. The returned tour is checked
/// against the problem before it is handed back.
/// </summary>
public static class TourSolver
{
    private const string VisitsDimension = "visits";

    /// <exception cref="OperationCanceledException">The token was cancelled before or during the search.</exception>
    public static TourSolution Solve(TourProblem problem, TourSolverSettings? settings = null, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(problem);
        settings ??= new TourSolverSettings();
        var timeLimit = settings.EffectiveTimeLimit(problem.NodeCount);
        if (timeLimit <= TimeSpan.Zero)
        {
            throw new ArgumentException($"The time limit must be positive; got {timeLimit}.", nameof(settings));
        }

        if (settings.SolutionLimit is < 1)
        {
            throw new ArgumentException($"The solution limit must be at least 1; got {settings.SolutionLimit}.", nameof(settings));
        }

        if (!System.Enum.IsDefined(settings.FirstSolution))
        {
            throw new ArgumentException($"Unknown first-solution strategy {settings.FirstSolution}.", nameof(settings));
        }

        cancellationToken.ThrowIfCancellationRequested();
        if (problem.VisitSets.Count <= 1)
        {
            return Trivial(problem);
        }

        var solution = SolveWithRouting(problem, settings, timeLimit, cancellationToken);
        cancellationToken.ThrowIfCancellationRequested();
        var violation = problem.FindViolation(solution.Visits);
        return violation is null
            ? solution
            : throw new InvalidOperationException($"The routing model returned an infeasible tour ({violation}); this is a modelling bug.");
    }

    private static TourSolution Trivial(TourProblem problem)
    {
        int[] visits = [problem.Start];
        if (problem.VisitSets.Count == 1)
        {
            var best = problem.VisitSets[0].MinBy(node => problem.TourCost([problem.Start, node]));
            visits = [problem.Start, best];
        }

        return new TourSolution(visits, problem.TourCost(visits), TourStatus.Optimal, new TourSolverStatistics(TourEngine.Trivial, 1, false, null));
    }

    private static TourSolution SolveWithRouting(TourProblem problem, TourSolverSettings settings, TimeSpan timeLimit, CancellationToken cancellationToken)
    {
        var open = problem.Kind == TourKind.Open;
        var n = problem.NodeCount;
        var modelNodes = open ? n + 1 : n;
        var matrix = problem.CostRows();
        if (open)
        {
            // The dummy end: reached from every node at zero cost; nothing leaves it.
            matrix = [.. matrix.Select(row => (long[])[.. row, 0]), new long[modelNodes]];
        }

        using var manager = open
            ? new RoutingIndexManager(modelNodes, 1, [problem.Start], [n])
            : new RoutingIndexManager(modelNodes, 1, problem.Start);
        using var routing = new RoutingModel(manager);
        var arcCost = routing.RegisterTransitMatrix(matrix);
        routing.SetArcCostEvaluatorOfAllVehicles(arcCost);

        foreach (var group in problem.Groups)
        {
            if (group.Count > 1)
            {
                routing.AddDisjunction([.. group.Select(node => manager.NodeToIndex(node))]);
            }
        }

        if (problem.Precedences.Count > 0)
        {
            AddPrecedences(problem, manager, routing, modelNodes);
        }

        long solutionsFound = 0;
        VoidToVoid countSolution = () => solutionsFound++;
        routing.AddAtSolutionCallback(countSolution);

        var parameters = operations_research_constraint_solver.DefaultRoutingSearchParameters();
        parameters.FirstSolutionStrategy = Strategy(settings.FirstSolution);
        parameters.LocalSearchMetaheuristic = settings.Search == TourSearch.GreedyDescent
            ? LocalSearchMetaheuristic.Types.Value.GreedyDescent
            : LocalSearchMetaheuristic.Types.Value.GuidedLocalSearch;
        parameters.TimeLimit = Duration.FromTimeSpan(timeLimit);
        parameters.LogSearch = false;

        // Measured on TSPLIB (eil51, berlin52, st70, kroA100, br17, ftv33): letting a multi-armed bandit pick
        // the next neighbourhood reaches 1 % of the optimum in a fraction of the accepted solutions (and of
        // the time) that the fixed operator order needs.
        parameters.UseMultiArmedBanditConcatenateOperators = true;
        if (settings.SolutionLimit is { } limit)
        {
            parameters.SolutionLimit = limit;
        }

        // Cancellation: the registration interrupts a running search at once (CancelSearch only sets atomic
        // flags, so any thread may call it); the custom limit also sees a cancellation that came before the
        // search began, at the search's next limit check.
        VoidToBoolean cancelled = () => cancellationToken.IsCancellationRequested;
        routing.AddSearchMonitor(routing.solver().MakeCustomLimit(cancelled));
        Assignment? assignment;
        using (cancellationToken.Register(routing.CancelSearch))
        {
            var warm = settings.InitialVisits is { } given && problem.FindViolation(given) is null ? given : null;
            if (problem.Precedences.Count > 0 || warm is not null)
            {
                // A warm start begins from the given tour. Measured: on 40 nodes with random precedences
                // PATH_CHEAPEST_ARC found no first solution within two minutes, the rank constraints being
                // invisible to its filters; the greedy tour is feasible.
                routing.CloseModelWithParameters(parameters);
                var first = warm ?? GreedyTour.Build(problem);
                var route = first.Skip(1).Select(node => manager.NodeToIndex(node)).ToArray();
                var initial = routing.ReadAssignmentFromRoutes([route], true);
                assignment = initial is null ? null : routing.SolveFromAssignmentWithParameters(initial, parameters);
            }
            else
            {
                assignment = routing.SolveWithParameters(parameters);
            }
        }

        // Native code calls these delegates during the search; keep them reachable until it is over.
        GC.KeepAlive(cancelled);
        GC.KeepAlive(countSolution);
        cancellationToken.ThrowIfCancellationRequested();
        var status = routing.GetStatus();
        var statistics = new TourSolverStatistics(
            TourEngine.Routing,
            solutionsFound,
            settings.SolutionLimit is { } cap && solutionsFound >= cap,
            status.ToString());
        if (assignment is null)
        {
            var fallback = GreedyTour.Build(problem);
            return new TourSolution(fallback, problem.TourCost(fallback), TourStatus.Feasible, statistics with { Engine = TourEngine.GreedyFallback });
        }

        var visits = new List<int>(problem.TourLength);
        for (var index = routing.Start(0); !routing.IsEnd(index); index = assignment.Value(routing.NextVar(index)))
        {
            visits.Add(manager.IndexToNode(index));
        }

        var proved = status == RoutingSearchStatus.Types.Value.RoutingOptimal;
        return new TourSolution(visits, problem.TourCost(visits), proved ? TourStatus.Optimal : TourStatus.Feasible, statistics);
    }

    private static void AddPrecedences(TourProblem problem, RoutingIndexManager manager, RoutingModel routing, int modelNodes)
    {
        // Cumul of a node = number of arcs before it = its position in the route (the start has 0).
        routing.AddConstantDimension(1, modelNodes + 1, true, VisitsDimension);
        var visits = routing.GetMutableDimension(VisitsDimension);
        var solver = routing.solver();
        var ranks = new Dictionary<int, IntExpr>();

        IntExpr Rank(int group)
        {
            if (ranks.TryGetValue(group, out var rank))
            {
                return rank;
            }

            var nodes = problem.Groups[group];
            if (nodes.Count == 1)
            {
                rank = visits.CumulVar(manager.NodeToIndex(nodes[0]));
            }
            else
            {
                // Exactly one node of the group is active, so the sum is that node's position.
                var terms = new IntVarVector();
                foreach (var node in nodes)
                {
                    var index = manager.NodeToIndex(node);
                    terms.Add(solver.MakeProd(visits.CumulVar(index), routing.ActiveVar(index)).Var());
                }

                rank = solver.MakeSum(terms);
            }

            ranks[group] = rank;
            return rank;
        }

        foreach (var p in problem.Precedences)
        {
            solver.Add(solver.MakeLess(Rank(p.Before), Rank(p.After)));
        }
    }

    private static FirstSolutionStrategy.Types.Value Strategy(TourFirstSolutionStrategy strategy) => strategy switch
    {
        TourFirstSolutionStrategy.PathCheapestArc => FirstSolutionStrategy.Types.Value.PathCheapestArc,
        TourFirstSolutionStrategy.ParallelCheapestInsertion => FirstSolutionStrategy.Types.Value.ParallelCheapestInsertion,
        TourFirstSolutionStrategy.LocalCheapestInsertion => FirstSolutionStrategy.Types.Value.LocalCheapestInsertion,
        TourFirstSolutionStrategy.Savings => FirstSolutionStrategy.Types.Value.Savings,
        TourFirstSolutionStrategy.Christofides => FirstSolutionStrategy.Types.Value.Christofides,
        TourFirstSolutionStrategy.Automatic => FirstSolutionStrategy.Types.Value.Automatic,
        _ => throw new ArgumentOutOfRangeException(nameof(strategy), strategy, "Unknown first-solution strategy."),
    };
}
