using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Stops;
using Orchard.Core.Timing;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Turns one stop's tour into the schedule's stop: per cut the travel from the previous clear pose (a
/// timed joint trajectory), the approach from the clear pose to the cut and back, and at the end the
/// return to stow. A cut whose move cannot be found is left out (the caller may give it to another
/// stop) and the arm carries on from where it was. Every stop ends at stow through a checked move: when
/// none is found from the last cut's clear pose, that cut is taken out again and the return is tried
/// from the one before.
/// <para>
/// Ordering planned every move against the whole tree (safe whatever falls). Here each move is planned
/// once more against the tree as it will be, with the wood of the cuts already made gone, and kept when
/// faster; such a move names the cuts whose wood must have fallen for it to be free (<c>dependsOnCuts</c>).
/// </para>
/// </summary>
internal static class ScheduleBuilder
{
    public const string StowKey = "stow";

    public static StopBuild Build(
        StandSurvey survey,
        StopOrder tour,
        MoveOracle oracle,
        int stopSequence,
        double platformMoveSeconds,
        double startSecond,
        int firstStepSequence,
        StartAssessment? start,
        FallingWood wood,
        CancellationToken cancellationToken)
    {
        var cell = survey.Cell;
        var scan = cell.Scan;
        var arm = cell.Profile;
        var settings = oracle.Settings;
        var limits = oracle.Limits;
        var nodes = tour.Nodes;
        var startNode = nodes[tour.Order[0]];
        var failed = new List<int>();
        var clock = startSecond;

        IReadOnlyList<TrajectoryPoint> retreat = [];
        var retreatSeconds = 0.0;
        if (start is { RetreatPath.Count: > 1 })
        {
            var timedRetreat = ApproachTiming.TimeLine(start.RetreatPath, start.RetreatStationsM, limits, oracle.Checker, _ => settings.ApproachSpeedMS, settings.ApproachAccelerationMS2, i => start.SegmentToolIgnoreGroups[i]);
            (retreatSeconds, retreat) = (timedRetreat.DurationS, timedRetreat.Knots);
        }

        clock += retreatSeconds;
        var made = new List<(ScheduleStep Step, TourNode Node)>();
        var previous = startNode;
        for (var k = 1; k < tour.Order.Count; k++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var to = nodes[tour.Order[k]];
            var (move, travel, dependsOn) = BestMove(cell, oracle, previous, to, wood, cancellationToken);
            if (!move.Success)
            {
                failed.Add(to.CutIndex);
                continue;
            }

            var cut = scan.Cuts[to.CutIndex];
            var cutSeconds = arm.CutTime.SecondsFor(cut.DiameterMm);
            var candidate = to.Candidate!;
            var approach = to.Approach!;
            var step = new ScheduleStep(
                firstStepSequence + made.Count, cut.Id, clock, travel!.DurationS, approach.DurationS, cutSeconds, approach.DurationS,
                candidate.CandidateIndex, candidate.ApproachAngleRad, candidate.ClearConfiguration.ToArray(), candidate.PreCutConfiguration.ToArray(), candidate.CutConfiguration.ToArray(),
                MethodName(move.Method), travel.Knots, approach.Knots, approach.PreCutSecond, dependsOn.Select(c => scan.Cuts[c].Id).ToArray());
            made.Add((step, to));
            clock += travel.DurationS + to.ServiceSeconds;
            wood.Add(to.CutIndex);
            previous = to;
        }

        // Back to stow from the last clear pose; if no move is found, take the last cut out and try again.
        var stow = new TourNode(StowKey, -1, null, arm.StowConfiguration.ToArray(), 0, null);
        (PlannedMove Move, TimedPath? Timed, IReadOnlyList<int> DependsOn) back;
        while (true)
        {
            back = previous.Key == StowKey
                ? (new PlannedMove(true, [stow.Configuration, stow.Configuration], 0, PlannerMethod.Direct), PathTiming.Time([stow.Configuration], limits), [])
                : BestMove(cell, oracle, previous, stow, wood, cancellationToken);
            if (!back.Move.Success)
            {
                var more = ReturnWithMoreBudget(cell, oracle, previous, stow, cancellationToken);
                back = (more, more.Success ? SmoothTiming.Time(more.Path, limits, oracle.Checker) : null, []);
            }

            if (back.Move.Success || made.Count == 0)
            {
                break;
            }

            var (dropped, _) = made[^1];
            made.RemoveAt(made.Count - 1);
            var droppedCut = scan.Cuts.Select((c, i) => (c, i)).First(p => p.c.Id == dropped.CutId).i;
            failed.Add(droppedCut);
            wood.Remove(droppedCut);
            clock = dropped.StartSecond;
            previous = made.Count > 0 ? made[^1].Node : startNode;
        }

        var returnTrajectory = back.Move.Success ? back.Timed : null;
        var returnSeconds = returnTrajectory?.DurationS ?? 0;
        var stop = new ScheduleStop(
            stopSequence, survey.Stand.Side, survey.Stand.ArmBase, survey.Stand.AlongRowOffsetM, survey.Stand.IntoAlleyOffsetM,
            platformMoveSeconds, startSecond, (start?.RetreatPath[0] ?? startNode.Configuration).ToArray(), retreatSeconds, retreat,
            made.Select(m => m.Step).ToArray(), returnSeconds, back.Move.Success ? MethodName(back.Move.Method) : "none",
            returnTrajectory?.Knots ?? [], back.DependsOn.Select(c => scan.Cuts[c].Id).ToArray());
        return new StopBuild(stop, failed, back.Move.Success);
    }

    /// <summary>The move as planned for ordering (whole tree), or one planned against the tree as it is by then when that is faster.</summary>
    private static (PlannedMove Move, TimedPath? Timed, IReadOnlyList<int> DependsOn) BestMove(WorkCell cell, MoveOracle oracle, TourNode from, TourNode to, FallingWood wood, CancellationToken cancellationToken)
    {
        var full = oracle.Get(from, to);
        var fullTimed = full.Success ? oracle.Timed(from, to, full) : null;
        var settings = oracle.Settings;
        // Through freed space: to find a way the whole tree does not leave (the planner's full budgets), or, when
        // improving is on, a faster way (the primary planner alone, on a small budget).
        var rescue = !full.Success;
        if (!settings.AssumeFallingWood || wood.Fallen.Count == 0 || (!rescue && (!settings.ReplanMovesAgainstCurrentScene || full.Path.Count == 2)))
        {
            return (full, fullTimed, []);
        }

        var thinner = cell.WithScene(Scene.WithoutBranches(cell.Scan, wood.Fallen));
        var checker = thinner.CreateChecker();
        var seed = StableHash.Of(settings.Seed, cell.Scan.TreeId, oracle.StandKey, from.Key, to.Key, "now:" + wood.Fallen.Count);
        var planner = rescue ? settings.Planner : settings.Planner with { UseFallback = false, Primary = settings.Planner.Primary with { MaxCollisionChecks = 4000 } };
        var result = new MovePlanner(planner).Plan(from.Configuration, to.Configuration, checker, new DeterministicRandom(seed), oracle.Clock, cancellationToken);
        if (!result.Success)
        {
            return (full, fullTimed, []);
        }

        var timed = SmoothTiming.Time(result.Path, oracle.Limits, checker);
        if (full.Success && timed.DurationS >= fullTimed!.DurationS)
        {
            return (full, fullTimed, []);
        }

        return (new PlannedMove(true, result.Path, timed.DurationS, result.Method), timed, DependsOn(cell, result.Path, timed.Knots, wood));
    }

    /// <summary>
    /// The cuts whose fallen wood a path planned through freed space needs gone: the wood the path would
    /// touch in the whole tree, by dense sampling, traced to the cut that takes it; confirmed by checking
    /// the path with only that wood removed, and every cut with fallen wood when that check fails.
    /// </summary>
    private static int[] DependsOn(WorkCell cell, IReadOnlyList<double[]> path, IReadOnlyList<TrajectoryPoint> knots, FallingWood wood)
    {
        var full = cell.CreateChecker();
        var cuts = new SortedSet<int>();
        foreach (var q in PathSampling.Samples(knots.Select(k => k.Positions.ToArray()).ToList(), cell.Arm, DensePathCheck.MaxPointStepM))
        {
            if (full.IsFree(q))
            {
                continue;
            }

            var report = full.Check(q);
            var branch = report.SceneCapsule >= 0 ? cell.Scene.BranchOfCapsule[report.SceneCapsule] : -1;
            var cut = branch >= 0 ? wood.CutTaking(branch) : -1;
            if (cut >= 0)
            {
                cuts.Add(cut);
            }
        }

        var removed = cuts.SelectMany(wood.FallenOf).ToHashSet();
        var check = cell.WithScene(Scene.WithoutBranches(cell.Scan, removed)).CreateChecker();
        var pathFree = Enumerable.Range(0, path.Count - 1).All(i => check.IsEdgeFree(path[i], path[i + 1]));
        return pathFree && TrajectoryCheck.BadIntervals(knots, check, skipStraight: true).Count == 0
            ? cuts.ToArray()
            : wood.Cuts.Where(c => wood.FallenOf(c).Count > 0).Order().ToArray();
    }

    /// <summary>A return to stow the ordering's budget did not find: the full default planner, with its larger budgets.</summary>
    private static PlannedMove ReturnWithMoreBudget(WorkCell cell, MoveOracle oracle, TourNode from, TourNode stow, CancellationToken cancellationToken)
    {
        var seed = StableHash.Of(oracle.Settings.Seed, cell.Scan.TreeId, oracle.StandKey, from.Key, "stow:more");
        var result = new MovePlanner(MovePlannerSettings.Default).Plan(from.Configuration, stow.Configuration, oracle.Checker, new DeterministicRandom(seed), oracle.Clock, cancellationToken);
        return result.Success
            ? new PlannedMove(true, result.Path, SmoothTiming.Time(result.Path, oracle.Limits, oracle.Checker).DurationS, result.Method)
            : new PlannedMove(false, [], double.MaxValue, result.Method);
    }

    public static string MethodName(PlannerMethod method) => method switch
    {
        PlannerMethod.Direct => "direct",
        PlannerMethod.Plain => "plain",
        PlannerMethod.CostAware => "cost-aware",
        PlannerMethod.Greedy => "greedy",
        PlannerMethod.Via => "via",
        _ => "rrt-connect",
    };
}
