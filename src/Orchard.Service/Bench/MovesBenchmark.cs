using Orchard.Core.Collision;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Timing;

namespace Orchard.Service.Bench;

/// <summary>
/// Every planner variant on the same demo moves, one after another in one run, each with the same
/// shortcutting and no fallback: success over every move (a move no variant solves directly but one solves
/// through stow still counts against all), plan time (median, p95), collision checks, path length, and the
/// execution time of the emitted trajectory, ranked by it. Each variant also runs as the previous build did
/// (no final visibility pass, every waypoint a stop), on the same moves and seeds, so the gain is a ratio
/// measured side by side.
/// </summary>
internal static class MovesBenchmark
{
    public sealed record VariantResult(
        string Name,
        double SuccessRate,
        double SuccessViaStowRate,
        double MedianPlanMs,
        double P95PlanMs,
        double MeanCollisionChecks,
        double MeanShortcutChecks,
        double FailedChecksShare,
        double MeanExecutionSeconds,
        double MeanExecutionSecondsPrevious,
        double BlockedExecutionRatio,
        double ExecutionVsRrtOnCommon,
        double MeanCorners,
        double MeanCornersPrevious,
        double MeanPathLengthRad,
        double MinClearanceM,
        int Moves,
        int Solved,
        int BlockedSolvedBoth,
        int DenseBadSamples,
        long DenseSamples);

    public sealed record Result(IReadOnlyList<VariantResult> Variants, int Moves, int Blocked, int SolvableByAny, int SolvableViaStow, int Trees, string Endpoints, MachineInfo Machine);

    public static IReadOnlyList<(string Name, IMotionPlanner Planner)> Planners() =>
    [
        ("plain", new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.Plain })),
        ("cost-aware", new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.CostAware })),
        ("cost-aware first-free-retries", new RecursiveMidpointPlanner(RmpdSettings.Default with { RetriesTakeFirstFree = true })),
        ("cost-aware no-early-join", new RecursiveMidpointPlanner(RmpdSettings.Default with { JoinGoalEarly = false })),
        ("cost-aware previous-settings", new RecursiveMidpointPlanner(RmpdSettings.Default with { MaxDepth = 7, MidpointRetries = 3, InitialSpreadFraction = 0.25, JoinGoalEarly = false })),
        ("cost-aware (radians)", new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.CostAware, DetourMeasure = DetourMeasure.Distance })),
        ("greedy", new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.Greedy })),
        ("rrt-connect", new RrtConnectPlanner(RrtConnectSettings.Default)),
        ("production", new FallbackPlanner(new RecursiveMidpointPlanner(MovePlannerSettings.Default.Primary), new RrtConnectPlanner(MovePlannerSettings.Default.Fallback))),
    ];

    private sealed record MoveRun(bool Ok, bool ViaStow, double Ms, long Checks, long ShortcutChecks, double ExecS, double ExecPreviousS, int Corners, int CornersPrevious, double LengthRad, double ClearanceM, bool OkPrevious);

    /// <param name="only">Variants to run by name (RRT-Connect, the reference, always runs); null runs every one.</param>
    public static Result Run(int trees, bool verify, bool clearPoses, IReadOnlyCollection<string>? only, Action<string>? progress, CancellationToken cancellationToken)
    {
        var moves = DemoMoves.Build(trees, clearPoses, cancellationToken);
        var checkers = moves.Select(m => m.Cell).Distinct().ToDictionary(c => c, c => c.CreateChecker());
        var blocked = moves.Select(m => !checkers[m.Cell].IsEdgeFree(m.From, m.To)).ToArray();
        var planners = Planners().Where(p => only is null || p.Name == "rrt-connect" || only.Contains(p.Name)).ToList();
        var results = new List<(string Name, List<MoveRun> Runs, int Bad, long Samples)>();
        var solvedAny = new bool[moves.Count];
        var viaStowAny = new bool[moves.Count];
        foreach (var (name, planner) in planners)
        {
            progress?.Invoke($"{name}: {moves.Count} moves ({blocked.Count(b => b)} with the straight line blocked)");
            var now = new MovePlanner(planner, ShortcutSettings.Default);
            var before = new MovePlanner(planner, ShortcutSettings.Default with { DropVisibleWaypoints = false });
            var runs = new List<MoveRun>(moves.Count);
            var bad = 0;
            var samples = 0L;
            for (var m = 0; m < moves.Count; m++)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var move = moves[m];
                var checker = checkers[move.Cell];
                var limits = JointSpeedLimits.From(move.Cell.Profile);
                var result = now.Plan(move.From, move.To, checker, DeterministicRandom.ForStream(77, (ulong)m), TimeProvider.System, cancellationToken);
                var previous = before.Plan(move.From, move.To, checker, DeterministicRandom.ForStream(77, (ulong)m), TimeProvider.System, cancellationToken);
                if (!result.Success)
                {
                    // Through stow: two moves the same planner makes, joined at the stowed arm.
                    var stow = move.Cell.Profile.StowConfiguration.ToArray();
                    var first = now.Plan(move.From, stow, checker, DeterministicRandom.ForStream(78, (ulong)m), TimeProvider.System, cancellationToken);
                    var second = first.Success ? now.Plan(stow, move.To, checker, DeterministicRandom.ForStream(79, (ulong)m), TimeProvider.System, cancellationToken) : first;
                    var via = first.Success && second.Success;
                    viaStowAny[m] |= via;
                    runs.Add(new MoveRun(false, via, result.Statistics.Elapsed.TotalMilliseconds, result.Statistics.CollisionChecks, 0, 0, 0, 0, 0, 0, double.NaN, previous.Success));
                    continue;
                }

                solvedAny[m] = true;
                var timed = SmoothTiming.Time(result.Path, limits, checker);
                var restToRest = previous.Success ? PathTiming.Time(previous.Path, limits, PathTimingOptions.RestToRest).DurationS : double.NaN;
                runs.Add(new MoveRun(true, true, result.Statistics.Elapsed.TotalMilliseconds, result.Statistics.CollisionChecks, result.Statistics.ShortcutChecks, timed.DurationS, restToRest,
                    result.Path.Count - 2, previous.Success ? previous.Path.Count - 2 : 0, result.PathLength, MinClearance(result.Path, checker), previous.Success));
                if (verify)
                {
                    var (b, s) = DensePathCheck.CountTrajectory(timed.Knots, checker);
                    bad += b;
                    samples += s;
                }
            }

            results.Add((name, runs, bad, samples));
        }

        var rrt = results.Single(r => r.Name == "rrt-connect").Runs;
        var variants = results.Select(r =>
        {
            var common = Enumerable.Range(0, moves.Count).Where(m => r.Runs[m].Ok && rrt[m].Ok).ToList();
            var ok = r.Runs.Where(x => x.Ok).ToList();
            var both = r.Runs.Select((x, m) => (x, m)).Where(p => p.x.Ok && p.x.OkPrevious && blocked[p.m]).Select(p => p.x).ToList();
            return new VariantResult(
                r.Name,
                (double)ok.Count / moves.Count,
                (double)r.Runs.Count(x => x.ViaStow) / moves.Count,
                BenchStatistics.Median(r.Runs.Select(x => x.Ms)),
                BenchStatistics.Percentile(r.Runs.Select(x => x.Ms), 0.95),
                r.Runs.Average(x => (double)x.Checks),
                r.Runs.Average(x => (double)x.ShortcutChecks),
                (double)r.Runs.Where(x => !x.Ok).Sum(x => x.Checks) / Math.Max(1, r.Runs.Sum(x => x.Checks)),
                ok.Count > 0 ? ok.Average(x => x.ExecS) : double.NaN,
                ok.Where(x => x.OkPrevious).DefaultIfEmpty().Average(x => x?.ExecPreviousS ?? double.NaN),
                both.Count > 0 ? both.Sum(x => x.ExecS) / both.Sum(x => x.ExecPreviousS) : double.NaN,
                common.Count > 0 ? common.Sum(m => r.Runs[m].ExecS) / common.Sum(m => rrt[m].ExecS) : double.NaN,
                ok.Count > 0 ? ok.Average(x => (double)x.Corners) : double.NaN,
                ok.Where(x => x.OkPrevious).DefaultIfEmpty().Average(x => (double)(x?.CornersPrevious ?? 0)),
                ok.Count > 0 ? ok.Average(x => x.LengthRad) : double.NaN,
                ok.Count > 0 ? ok.Min(x => x.ClearanceM) : double.NaN,
                moves.Count,
                ok.Count,
                both.Count,
                r.Bad,
                r.Samples);
        }).OrderBy(v => v.MeanExecutionSeconds).ToList();
        return new Result(variants, moves.Count, blocked.Count(b => b), solvedAny.Count(s => s), viaStowAny.Count(s => s), trees, clearPoses ? "clear poses" : "pre-cut poses", MachineInfo.Current());
    }

    /// <summary>Smallest clearance at samples 1 cm of tool travel apart (by the motion bound) along the path.</summary>
    private static double MinClearance(IReadOnlyList<double[]> path, CollisionChecker checker) =>
        PathSampling.Samples(path, checker.Arm, 0.01).Min(q => checker.ClearanceM(q));
}
