using System.Diagnostics.CodeAnalysis;
using Orchard.Core.Collision;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Reachability;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Turns a tree scan into a timed cut schedule, and re-plans it after a missed cut.
/// <list type="number">
/// <item>Reachability: each cut's usable approach candidates (or why none).</item>
/// <item>Which cuts to make: reachable ones that are not done, dropped or moot (<see cref="MootRule"/>).</item>
/// <item>A generalised TSP: one node per (cut, candidate), exactly one per cut, an open path from the
/// arm's configuration. Arc cost = move time to the candidate's pre-cut pose + its approach, cut and
/// retract, in integer milliseconds.</item>
/// <item>Lazy evaluation: solve on the straight joint-space time within the joint limits (what a move
/// costs when nothing is in the way, and all that a free move costs), plan with the collision-aware
/// planner only the moves the tour uses, replace their costs, repeat until the tour uses planned
/// moves only. Intermediate rounds search briefly; the tour is confirmed by a full search. All-pairs
/// planning stays selectable.</item>
/// <item>The schedule: trajectories and times per step, the return to stow, what was left out and why.
/// Ordering plans against the full tree (safe); afterwards each move is planned once more against
/// the scene as it is at that point (wood already cut off gone) and kept when faster.</item>
/// </list>
/// Deterministic for one seed: every move's randomness comes from a stream named by its two ends.
/// </summary>
public static class TreeSequencer
{
    private const string StowKey = "stow";

    /// <summary>Cost of a move the planner could not find, so the solver avoids it (1,000 s: more than any tree takes).</summary>
    private const long UnplannableMs = 1_000_000;

    public static (Schedule Schedule, TreePlanState State) Plan(TreeScan scan, ArmProfile arm, SequencingSettings settings, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(arm);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(clock);
        var began = clock.GetTimestamp();
        var cell = new WorkCell(scan, arm);
        var reachability = AnalyzeInParallel(cell, settings, cancellationToken);
        var reachSeconds = clock.GetElapsedTime(began).TotalSeconds;
        var state = new TreePlanState(reachability, new MoveCache());
        var request = new ReplanRequest(arm.StowConfiguration, [], [], null, RetryPolicy.Drop);
        var schedule = Sequence(cell, state, settings, request, StowKey, version: 1, began, reachSeconds, clock, cancellationToken);
        return (schedule, state);
    }

    public static Schedule Replan(TreeScan scan, ArmProfile arm, TreePlanState state, ReplanRequest request, int version, SequencingSettings settings, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(arm);
        ArgumentNullException.ThrowIfNull(state);
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(clock);
        var began = clock.GetTimestamp();
        var cell = new WorkCell(scan, arm);
        var startKey = "at:" + StableHash.Of(request.CurrentConfiguration.ToArray()).ToString("x16", System.Globalization.CultureInfo.InvariantCulture);
        // A re-plan must answer the waiting arm quickly: wider probing (cheap, mostly remembered), and the
        // moves as planned against the full tree (safe) without the slower current-scene improvement.
        var wider = settings with
        {
            ProbeNeighbours = Math.Max(settings.ProbeNeighbours, settings.ReplanProbeNeighbours),
            ReplanMovesAgainstCurrentScene = false,
        };
        return Sequence(cell, state, wider, request, startKey, version, began, 0, clock, cancellationToken);
    }

    /// <summary>Reachability of every cut, the cuts spread over threads; each cut's randomness is its own stream.</summary>
    public static IReadOnlyList<CutReachability> AnalyzeInParallel(WorkCell cell, SequencingSettings settings, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(settings);
        var results = new CutReachability[cell.Scan.Cuts.Count];
        var seed = StableHash.Of(settings.Seed, cell.Scan.TreeId, "reach");
        using var workers = new ThreadLocal<(CollisionChecker, InverseKinematics)>(() => (cell.CreateChecker(), new InverseKinematics(cell.Chain, settings.Reachability.InverseKinematics)));
        Parallel.For(0, results.Length, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, settings.Parallelism), CancellationToken = cancellationToken }, c =>
        {
            var (checker, ik) = workers.Value;
            results[c] = ReachabilityAnalyzer.AnalyzeCut(cell, checker, ik, settings.Reachability, c, DeterministicRandom.ForStream(seed, (ulong)c));
        });
        return results;
    }

    private sealed record Node(string Key, int CutIndex, CutCandidate? Candidate, double[] Configuration, double ServiceSeconds, double ApproachSeconds, IReadOnlyList<TrajectoryPoint> ApproachPoints);

    private static Schedule Sequence(WorkCell cell, TreePlanState state, SequencingSettings settings, ReplanRequest request, string startKey, int version, long began, double reachSeconds, TimeProvider clock, CancellationToken cancellationToken)
    {
        var scan = cell.Scan;
        var arm = cell.Profile;
        var limits = JointSpeedLimits.From(arm);
        var topology = new BranchTopology(scan);
        var cutIndex = Enumerable.Range(0, scan.Cuts.Count).ToDictionary(i => scan.Cuts[i].Id, StringComparer.Ordinal);
        var done = request.DoneCutIds.Where(cutIndex.ContainsKey).Select(id => cutIndex[id]).ToHashSet();
        var dropped = request.DroppedCutIds.Where(cutIndex.ContainsKey).Select(id => cutIndex[id]).ToHashSet();
        int? missed = request.MissedCutId is { } m && cutIndex.TryGetValue(m, out var mi) && !done.Contains(mi) ? mi : null;
        if (missed is { } dropMissed && request.Policy == RetryPolicy.Drop)
        {
            dropped.Add(dropMissed);
        }

        // Which cuts: reachable, not done or dropped; moot ones per policy.
        var unscheduled = new List<UnscheduledCut>();
        var live = new List<int>();
        for (var c = 0; c < scan.Cuts.Count; c++)
        {
            var cut = scan.Cuts[c];
            var reach = state.Reachability[c];
            if (done.Contains(c))
            {
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Done, null, "Reported done."));
            }
            else if (dropped.Contains(c))
            {
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Dropped, null, c == missed ? "Missed; the retry policy leaves it for a person." : "Left for a person."));
            }
            else if (!reach.IsReachable)
            {
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Unreachable, ReasonOf(reach.Reason!.Value), reach.Detail ?? string.Empty));
            }
            else
            {
                live.Add(c);
            }
        }

        var active = done.Concat(live).ToArray();
        var moot = MootRule.Find(scan, topology, active).Where(p => !done.Contains(p.Key)).ToDictionary(p => p.Key, p => p.Value);
        var scheduled = settings.Moot == MootPolicy.Drop ? live.Where(c => !moot.ContainsKey(c)).ToList() : live;
        if (settings.Moot == MootPolicy.Drop)
        {
            foreach (var (x, y) in moot.OrderBy(p => p.Key))
            {
                var status = done.Contains(y) ? "already cut off" : "will be cut off";
                unscheduled.Add(new UnscheduledCut(scan.Cuts[x].Id, UnscheduledStatus.Moot, UnscheduledReason.RemovedByCut, $"Its wood {status} by cut {scan.Cuts[y].Id}.", scan.Cuts[y].Id));
            }
        }

        // Nodes: the start, then every candidate of every scheduled cut.
        var nodes = new List<Node> { new(startKey, -1, null, request.CurrentConfiguration.ToArray(), 0, 0, []) };
        var groups = new List<IReadOnlyList<int>>();
        var groupOfCut = new Dictionary<int, int>();
        foreach (var c in scheduled)
        {
            var members = new List<int>();
            var cutSeconds = arm.CutTime.SecondsFor(scan.Cuts[c].DiameterMm);
            foreach (var candidate in state.Reachability[c].Candidates)
            {
                var (approachSeconds, points) = ApproachTiming.Time(candidate, arm.ApproachStandOffM, limits, settings.ApproachSpeedMS, settings.ApproachAccelerationMS2);
                members.Add(nodes.Count);
                nodes.Add(new Node($"c{c}/{candidate.CandidateIndex}", c, candidate, candidate.PreCutConfiguration.ToArray(), (2 * approachSeconds) + cutSeconds, approachSeconds, points));
            }

            groupOfCut[c] = groups.Count;
            groups.Add(members);
        }

        var precedences = new List<GroupPrecedence>();
        if (settings.Moot == MootPolicy.CutFirst)
        {
            precedences.AddRange(moot.Where(p => groupOfCut.ContainsKey(p.Value)).Select(p => new GroupPrecedence(groupOfCut[p.Key], groupOfCut[p.Value])));
        }

        // A retried cut goes first or last. Rather than a precedence over every other cut (which slows
        // the solver badly), arcs that break the rule carry a penalty larger than any tour: leaving the
        // retried cut (retry last), or leaving the start for any other cut (retry now).
        var retry = (First: new HashSet<int>(), Last: new HashSet<int>());
        if (missed is { } retried && groupOfCut.TryGetValue(retried, out var retriedGroup) && request.Policy != RetryPolicy.Drop)
        {
            (request.Policy == RetryPolicy.RetryNow ? retry.First : retry.Last).UnionWith(groups[retriedGroup]);
        }

        using var context = new MoveContext(cell, state.Moves, settings, limits, clock, cancellationToken) { Trace = settings.Trace };
        var (order, rounds) = Order(nodes, groups, precedences, retry, context, settings, cancellationToken);
        var schedule = BuildSchedule(cell, nodes, order, context, settings, request, version, unscheduled, done, topology, cancellationToken);
        var allPairs = AllPairsCount(nodes);
        var stats = new ScheduleStatistics(nodes.Count - 1, context.Planned, context.Probed, context.Reused, allPairs, context.Failed, rounds,
            clock.GetElapsedTime(began).TotalSeconds, reachSeconds, context.SolverSeconds, context.MoveSeconds, settings.Mode == EvaluationMode.Lazy ? "lazy" : "allPairs");
        return schedule with { Statistics = stats };
    }

    /// <summary>Every move between candidates of different cuts, and from the start to each candidate.</summary>
    private static int AllPairsCount(List<Node> nodes)
    {
        var count = 0;
        for (var i = 0; i < nodes.Count; i++)
        {
            for (var j = 1; j < nodes.Count; j++)
            {
                if (i != j && nodes[i].CutIndex != nodes[j].CutIndex)
                {
                    count++;
                }
            }
        }

        return count;
    }

    private static (List<int> Order, int Rounds) Order(List<Node> nodes, List<IReadOnlyList<int>> groups, List<GroupPrecedence> precedences, (HashSet<int> First, HashSet<int> Last) retry, MoveContext context, SequencingSettings settings, CancellationToken cancellationToken)
    {
        if (groups.Count == 0)
        {
            return ([0], 0);
        }

        var n = nodes.Count;
        var costs = new long[n][];
        var planned = new bool[n, n];
        for (var i = 0; i < n; i++)
        {
            costs[i] = new long[n];
            for (var j = 1; j < n; j++)
            {
                if (i == j || nodes[i].CutIndex == nodes[j].CutIndex)
                {
                    continue;
                }

                if (context.TryCached(nodes[i], nodes[j], out var move))
                {
                    planned[i, j] = true;
                    costs[i][j] = ArcMs(move, nodes[j]);
                }
                else
                {
                    costs[i][j] = Ms(TimeParameterizer.StraightLineSeconds(nodes[i].Configuration, nodes[j].Configuration, context.Limits) + nodes[j].ServiceSeconds);
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
                    if (i != j && nodes[i].CutIndex != nodes[j].CutIndex && !planned[i, j])
                    {
                        all.Add((i, j));
                    }
                }
            }

            PlanArcs(all, nodes, costs, planned, context, settings);
        }

        var probed = new bool[n, n];
        if (settings.Mode == EvaluationMode.Lazy && settings.ProbeNeighbours > 0)
        {
            var nearest = new List<(int From, int To)>();
            for (var i = 0; i < n; i++)
            {
                nearest.AddRange(Enumerable.Range(1, n - 1)
                    .Where(j => j != i && nodes[j].CutIndex != nodes[i].CutIndex && !planned[i, j])
                    .OrderBy(j => costs[i][j] - Ms(nodes[j].ServiceSeconds))
                    .ThenBy(j => j)
                    .Take(settings.ProbeNeighbours)
                    .Select(j => (i, j)));
            }

            ProbeArcs(nearest, nodes, costs, planned, probed, context, settings);
        }

        // Lazy rounds. A tour move not yet looked at is probed (its straight line checked: free is
        // exact at once, blocked gets a guessed detour cost); only when the tour uses no unprobed move
        // are its blocked moves planned in full. The tour is final when it uses planned moves only.
        var rounds = 0;
        List<int> order;
        while (true)
        {
            cancellationToken.ThrowIfCancellationRequested();
            rounds++;
            var problem = new TourProblem(Penalized(costs, retry), 0, TourKind.Open, groups, precedences);
            var limit = (long)(settings.SolutionLimitBase + (settings.SolutionLimitPerNode * n));
            var solveStart = context.Clock.GetTimestamp();
            var solution = TourSolver.Solve(problem, new TourSolverSettings(TimeLimit: settings.SolverTimeCap, SolutionLimit: limit), cancellationToken);
            context.SolverSeconds += context.Clock.GetElapsedTime(solveStart).TotalSeconds;
            order = solution.Visits.ToList();
            var unprobed = new List<(int, int)>();
            var guessed = new List<(int, int)>();
            for (var k = 0; k + 1 < order.Count; k++)
            {
                var (i, j) = (order[k], order[k + 1]);
                if (!planned[i, j])
                {
                    (probed[i, j] ? guessed : unprobed).Add((i, j));
                }
            }

            context.Trace?.Invoke($"round {rounds}: tour {order.Count}, cost {solution.TotalCost}, unprobed {unprobed.Count}, guessed {guessed.Count}");
            if (unprobed.Count == 0 && guessed.Count == 0)
            {
                break;
            }

            if (rounds >= settings.MaxLazyRounds)
            {
                PlanArcs([.. unprobed, .. guessed], nodes, costs, planned, context, settings);
                break;
            }

            if (unprobed.Count > 0 && settings.ProbeNeighbours > 0)
            {
                // Probe around the tour too: the moves it would switch to next are near the ones it uses.
                var around = unprobed.ToHashSet();
                foreach (var i in order)
                {
                    foreach (var j in Enumerable.Range(1, n - 1)
                        .Where(j => j != i && nodes[j].CutIndex != nodes[i].CutIndex && !probed[i, j] && !planned[i, j])
                        .OrderBy(j => costs[i][j] - Ms(nodes[j].ServiceSeconds))
                        .ThenBy(j => j)
                        .Take(settings.ProbeAroundTour))
                    {
                        around.Add((i, j));
                    }
                }

                ProbeArcs(around.OrderBy(a => a.Item1).ThenBy(a => a.Item2).ToList(), nodes, costs, planned, probed, context, settings);
            }
            else
            {
                PlanArcs([.. unprobed, .. guessed], nodes, costs, planned, context, settings);
            }
        }

        return (order, rounds);
    }

    /// <summary>
    /// Checks only the straight line of each move: a free one is an exact, planned (direct) move at
    /// once; a blocked one gets a guessed detour cost (<see cref="SequencingSettings.BlockedGuessFactor"/>
    /// × its straight-line time) until the tour needs it and it is planned in full. One edge check each.
    /// </summary>
    private static void ProbeArcs(List<(int From, int To)> arcs, List<Node> nodes, long[][] costs, bool[,] planned, bool[,] probed, MoveContext context, SequencingSettings settings)
    {
        var free = new bool[arcs.Count];
        var probeStart = context.Clock.GetTimestamp();
        Parallel.For(0, arcs.Count, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, settings.Parallelism), CancellationToken = context.CancellationToken }, k =>
        {
            free[k] = context.ProbeStraight(nodes[arcs[k].From], nodes[arcs[k].To]);
        });
        context.MoveSeconds += context.Clock.GetElapsedTime(probeStart).TotalSeconds;

        for (var k = 0; k < arcs.Count; k++)
        {
            var (i, j) = arcs[k];
            probed[i, j] = true;
            if (free[k])
            {
                planned[i, j] = true;
                context.TryCached(nodes[i], nodes[j], out var move);
                costs[i][j] = ArcMs(move!, nodes[j]);
            }
            else
            {
                var straight = TimeParameterizer.StraightLineSeconds(nodes[i].Configuration, nodes[j].Configuration, context.Limits);
                costs[i][j] = Ms((settings.BlockedGuessFactor * straight) + nodes[j].ServiceSeconds);
            }
        }
    }

    private static void PlanArcs(List<(int From, int To)> arcs, List<Node> nodes, long[][] costs, bool[,] planned, MoveContext context, SequencingSettings settings)
    {
        var moves = new PlannedMove[arcs.Count];
        var planStart = context.Clock.GetTimestamp();
        Parallel.For(0, arcs.Count, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, settings.Parallelism), CancellationToken = context.CancellationToken }, k =>
        {
            moves[k] = context.Get(nodes[arcs[k].From], nodes[arcs[k].To]);
        });
        context.MoveSeconds += context.Clock.GetElapsedTime(planStart).TotalSeconds;

        for (var k = 0; k < arcs.Count; k++)
        {
            var (i, j) = arcs[k];
            planned[i, j] = true;
            costs[i][j] = ArcMs(moves[k], nodes[j]);
        }
    }

    /// <summary>Larger than any tour's cost: arcs carrying it are used only if nothing else is possible.</summary>
    private const long RulePenaltyMs = 1_000_000_000;

    private static long[][] Penalized(long[][] costs, (HashSet<int> First, HashSet<int> Last) retry)
    {
        if (retry.First.Count == 0 && retry.Last.Count == 0)
        {
            return costs;
        }

        var copy = costs.Select(row => row.ToArray()).ToArray();
        for (var j = 1; j < copy.Length; j++)
        {
            if (retry.First.Count > 0 && !retry.First.Contains(j))
            {
                copy[0][j] += RulePenaltyMs;
            }
        }

        foreach (var i in retry.Last)
        {
            for (var j = 1; j < copy.Length; j++)
            {
                if (j != i)
                {
                    copy[i][j] += RulePenaltyMs;
                }
            }
        }

        return copy;
    }

    private static long ArcMs(PlannedMove move, Node to) => move.Success ? Ms(move.DurationS + to.ServiceSeconds) : UnplannableMs;

    private static long Ms(double seconds) => (long)Math.Round(seconds * 1000, MidpointRounding.AwayFromZero);

    private static Schedule BuildSchedule(WorkCell cell, List<Node> nodes, List<int> order, MoveContext context, SequencingSettings settings, ReplanRequest request, int version, List<UnscheduledCut> unscheduled, HashSet<int> done, BranchTopology topology, CancellationToken cancellationToken)
    {
        var scan = cell.Scan;
        var arm = cell.Profile;
        var limits = context.Limits;
        var steps = new List<ScheduleStep>();
        var clock = 0.0;
        var cutSoFar = done.Select(c => topology.BranchIndex[scan.Cuts[c].BranchId]).ToList();
        var stowNode = new Node(StowKey, -1, null, arm.StowConfiguration.ToArray(), 0, 0, []);
        for (var k = 1; k < order.Count; k++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var from = nodes[order[k - 1]];
            var to = nodes[order[k]];
            var move = BestMove(cell, context, settings, from, to, cutSoFar, topology);
            if (!move.Success)
            {
                // No collision-free move was found to this cut: leave it out, say so, carry on from where the arm is.
                unscheduled.Add(new UnscheduledCut(scan.Cuts[to.CutIndex].Id, UnscheduledStatus.Unreachable, UnscheduledReason.NoMove, "No collision-free move to its approach was found within the planning budget."));
                order.RemoveAt(k);
                k--;
                continue;
            }

            var travel = TimeParameterizer.Parameterize(move.Path, limits);
            var cut = scan.Cuts[to.CutIndex];
            var cutSeconds = arm.CutTime.SecondsFor(cut.DiameterMm);
            steps.Add(new ScheduleStep(
                steps.Count + 1, cut.Id, clock, travel.DurationS, to.ApproachSeconds, cutSeconds, to.ApproachSeconds,
                to.Candidate!.CandidateIndex, to.Candidate.ApproachAngleRad, to.Candidate.PreCutConfiguration, to.Candidate.PreCutConfiguration, to.Candidate.CutConfiguration,
                MethodName(move.Method), travel.Knots(), to.ApproachPoints, []));
            clock += travel.DurationS + to.ServiceSeconds;
            cutSoFar.Add(topology.BranchIndex[cut.BranchId]);
        }

        var last = nodes[order[^1]];
        var back = BestMove(cell, context, settings, last, stowNode, cutSoFar, topology);
        var returnTrajectory = back.Success ? TimeParameterizer.Parameterize(back.Path, limits) : null;
        var returnSeconds = returnTrajectory?.DurationS ?? 0;
        var stop = new ScheduleStop(1, StopSide.Near, scan.ArmBase, 0, 0, 0, 0, request.CurrentConfiguration.ToArray(), 0, [],
            steps, returnSeconds, back.Success ? MethodName(back.Method) : "none", returnTrajectory?.Knots() ?? []);
        var status = steps.Count == 0 && unscheduled.Any(u => u.Status == UnscheduledStatus.Unreachable && u.Reason == UnscheduledReason.NoMove) ? ScheduleStatus.NothingScheduled : ScheduleStatus.Complete;
        return new Schedule(
            scan.TreeId, version, string.Empty, null, arm.Id, status, clock + returnSeconds, clock + returnSeconds, 0, [stop],
            unscheduled.OrderBy(u => u.CutId, StringComparer.Ordinal).ToArray(), [],
            new ScheduleStatistics(0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, string.Empty));
    }

    /// <summary>The full-scene move, or, when enabled and faster, one planned against the scene with the wood cut so far removed.</summary>
    private static PlannedMove BestMove(WorkCell cell, MoveContext context, SequencingSettings settings, Node from, Node to, List<int> cutBranches, BranchTopology topology)
    {
        var full = context.Get(from, to);
        if (!settings.ReplanMovesAgainstCurrentScene || cutBranches.Count == 0 || (full.Success && full.Path.Count == 2))
        {
            return full;
        }

        var fallen = topology.FallenBeyond(cutBranches);
        if (fallen.Count == 0)
        {
            return full;
        }

        var thinner = cell.WithScene(Scene.WithoutBranches(cell.Scan, fallen));
        var checker = thinner.CreateChecker();
        var seed = StableHash.Of(settings.Seed, cell.Scan.TreeId, from.Key, to.Key, "now:" + fallen.Count);
        // An improvement only: the primary planner alone, on a small budget.
        var quick = settings.Planner with { UseFallback = false, Primary = settings.Planner.Primary with { MaxCollisionChecks = 4000 } };
        var result = new MovePlanner(quick).Plan(from.Configuration, to.Configuration, checker, new DeterministicRandom(seed), context.Clock, context.CancellationToken);
        if (!result.Success)
        {
            return full;
        }

        var seconds = TimeParameterizer.Parameterize(result.Path, context.Limits).DurationS;
        return !full.Success || seconds < full.DurationS ? new PlannedMove(true, result.Path, seconds, result.Method) : full;
    }

    private static UnscheduledReason ReasonOf(UnreachableReason reason) => reason switch
    {
        UnreachableReason.AboveShearRating => UnscheduledReason.AboveShearRating,
        UnreachableReason.OutOfReach => UnscheduledReason.OutOfReach,
        UnreachableReason.JointLimits => UnscheduledReason.JointLimits,
        _ => UnscheduledReason.Collision,
    };

    private static string MethodName(PlannerMethod method) => method switch
    {
        PlannerMethod.Direct => "direct",
        PlannerMethod.Plain => "plain",
        PlannerMethod.CostAware => "cost-aware",
        PlannerMethod.Greedy => "greedy",
        _ => "rrt-connect",
    };

    /// <summary>Plans moves on demand against the full scene, through the tree's move cache; counts what it did.</summary>
    private sealed class MoveContext(WorkCell cell, MoveCache cache, SequencingSettings settings, JointSpeedLimits limits, TimeProvider clock, CancellationToken cancellationToken) : IDisposable
    {
        private readonly MovePlanner _planner = new(settings.Planner);
        private readonly ThreadLocal<CollisionChecker> _checkers = new(cell.CreateChecker);
        private int _planned;
        private int _probed;
        private int _reused;
        private int _failed;
        private readonly HashSet<(string, string)> _seen = [];

        public JointSpeedLimits Limits { get; } = limits;

        public TimeProvider Clock { get; } = clock;

        public Action<string>? Trace { get; set; }

        public double SolverSeconds { get; set; }

        public double MoveSeconds { get; set; }

        public CancellationToken CancellationToken { get; } = cancellationToken;

        public int Planned => _planned;

        public int Reused => _reused;

        public int Failed => _failed;

        public bool TryCached(Node from, Node to, [NotNullWhen(true)] out PlannedMove? move)
        {
            if (cache.TryGet(from.Key, to.Key, out var found))
            {
                Count(from, to, reused: true);
                move = found;
                return true;
            }

            move = null;
            return false;
        }

        public PlannedMove Get(Node from, Node to)
        {
            if (cache.TryGet(from.Key, to.Key, out var cached))
            {
                return cached;
            }

            var seed = StableHash.Of(settings.Seed, cell.Scan.TreeId, from.Key, to.Key);
            var result = _planner.Plan(from.Configuration, to.Configuration, _checkers.Value!, new DeterministicRandom(seed), Clock, CancellationToken);
            var move = result.Success
                ? new PlannedMove(true, result.Path, TimeParameterizer.Parameterize(result.Path, Limits).DurationS, result.Method)
                : new PlannedMove(false, [], double.MaxValue, result.Method);
            cache.Add(from.Key, to.Key, move);
            Interlocked.Increment(ref _planned);
            if (!move.Success)
            {
                Interlocked.Increment(ref _failed);
            }

            return move;
        }

        public int Probed => _probed;

        /// <summary>Checks the straight line only; a free one goes into the cache as a planned (direct) move.</summary>
        public bool ProbeStraight(Node from, Node to)
        {
            if (cache.TryGet(from.Key, to.Key, out var cached))
            {
                return cached.Success && cached.Path.Count == 2;
            }

            if (cache.IsStraightBlocked(from.Key, to.Key))
            {
                return false;
            }

            Interlocked.Increment(ref _probed);
            if (!_checkers.Value!.IsEdgeFree(from.Configuration, to.Configuration))
            {
                cache.MarkStraightBlocked(from.Key, to.Key);
                return false;
            }

            var path = new[] { from.Configuration, to.Configuration };
            cache.Add(from.Key, to.Key, new PlannedMove(true, path, TimeParameterizer.StraightLineSeconds(from.Configuration, to.Configuration, Limits), PlannerMethod.Direct));
            return true;
        }

        public void Dispose() => _checkers.Dispose();

        private void Count(Node from, Node to, bool reused)
        {
            lock (_seen)
            {
                if (_seen.Add((from.Key, to.Key)) && reused)
                {
                    _reused++;
                }
            }
        }
    }
}
