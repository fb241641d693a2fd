using Orchard.Core.Collision;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Timing;

namespace Orchard.Service.Bench;

/// <summary>
/// Every planner variant on the same demo moves, one after another in one run, each with the same
/// shortcutting and no fallback: success, plan time (median, p95), collision checks, path length,
/// execution time of the timed trajectory and the smallest clearance along the path.
/// </summary>
internal static class MovesBenchmark
{
    public sealed record VariantResult(
        string Name,
        double SuccessRate,
        double SuccessOfSolvable,
        double MedianPlanMs,
        double P95PlanMs,
        double MeanCollisionChecks,
        double MeanExecutionSeconds,
        double MeanPathLengthRad,
        double MinClearanceM,
        int Moves,
        int Solved,
        int DenseBadSamples,
        long DenseSamples);

    public sealed record Result(IReadOnlyList<VariantResult> Variants, int Moves, int SolvableByAny, int Trees, MachineInfo Machine);

    public static IReadOnlyList<(string Name, MovePlanner Planner)> Variants() =>
    [
        ("plain", new MovePlanner(new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.Plain }), ShortcutSettings.Default)),
        ("cost-aware", new MovePlanner(new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.CostAware }), ShortcutSettings.Default)),
        ("greedy", new MovePlanner(new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.Greedy }), ShortcutSettings.Default)),
        ("rrt-connect", new MovePlanner(new RrtConnectPlanner(RrtConnectSettings.Default), ShortcutSettings.Default)),
    ];

    public static Result Run(int trees, bool verify, Action<string>? progress, CancellationToken cancellationToken)
    {
        var moves = DemoMoves.Build(trees, cancellationToken);
        var checkers = moves.Select(m => m.Cell).Distinct().ToDictionary(c => c, c => c.CreateChecker());
        var variants = Variants();
        var solved = new bool[variants.Count, moves.Count];
        var raw = new List<(string Name, List<(bool Ok, double Ms, long Checks, double ExecS, double LengthRad, double ClearanceM)> Runs, int Bad, long Samples)>();
        for (var v = 0; v < variants.Count; v++)
        {
            var (name, planner) = variants[v];
            progress?.Invoke($"{name}: {moves.Count} moves");
            var runs = new List<(bool, double, long, double, double, double)>(moves.Count);
            var bad = 0;
            var samples = 0L;
            for (var m = 0; m < moves.Count; m++)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var move = moves[m];
                var checker = checkers[move.Cell];
                var result = planner.Plan(move.From, move.To, checker, DeterministicRandom.ForStream(77, (ulong)m), TimeProvider.System, cancellationToken);
                solved[v, m] = result.Success;
                if (!result.Success)
                {
                    if (Environment.GetEnvironmentVariable("ORCHARD_BENCH_DEBUG") is not null)
                    {
                        progress?.Invoke($"  {name} move {m}: {result.Failure} (|Δq| {JointSpace.Distance(move.From, move.To):F2}, checks {result.Statistics.CollisionChecks}, depth {result.Statistics.MaxDepth})");
                    }

                    runs.Add((false, result.Statistics.Elapsed.TotalMilliseconds, result.Statistics.CollisionChecks, 0, 0, double.NaN));
                    continue;
                }

                var seconds = TimeParameterizer.Parameterize(result.Path, JointSpeedLimits.From(move.Cell.Profile)).DurationS;
                var clearance = MinClearance(result.Path, checker);
                runs.Add((true, result.Statistics.Elapsed.TotalMilliseconds, result.Statistics.CollisionChecks, seconds, result.PathLength, clearance));
                if (verify)
                {
                    var (b, s) = DensePathCheck.Count(result.Path, checker);
                    bad += b;
                    samples += s;
                }
            }

            raw.Add((name, runs, bad, samples));
        }

        var solvable = Enumerable.Range(0, moves.Count).Count(m => Enumerable.Range(0, variants.Count).Any(v => solved[v, m]));
        var results = raw.Select(r =>
        {
            var ok = r.Runs.Where(x => x.Ok).ToList();
            return new VariantResult(
                r.Name,
                (double)ok.Count / moves.Count,
                solvable == 0 ? 1 : (double)ok.Count / solvable,
                BenchStatistics.Median(r.Runs.Select(x => x.Ms)),
                BenchStatistics.Percentile(r.Runs.Select(x => x.Ms), 0.95),
                r.Runs.Average(x => (double)x.Checks),
                ok.Count > 0 ? ok.Average(x => x.ExecS) : double.NaN,
                ok.Count > 0 ? ok.Average(x => x.LengthRad) : double.NaN,
                ok.Count > 0 ? ok.Min(x => x.ClearanceM) : double.NaN,
                moves.Count,
                ok.Count,
                r.Bad,
                r.Samples);
        }).ToList();
        return new Result(results, moves.Count, solvable, trees, MachineInfo.Current());
    }

    /// <summary>Smallest clearance at samples 1 cm of tool travel apart (by the motion bound) along the path.</summary>
    private static double MinClearance(IReadOnlyList<double[]> path, CollisionChecker checker) =>
        PathSampling.Samples(path, checker.Arm, 0.01).Min(q => checker.ClearanceM(q));
}
