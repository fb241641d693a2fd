using System.Diagnostics;
using Orchard.Core.Demo;
using Orchard.Core.Sequencing;

namespace Orchard.Service.Bench;

/// <summary>
/// Scan → schedule on demo trees: lazy evaluation against all-pairs planning and a bottom-up sweep,
/// and the time of a re-plan after a missed cut.
/// </summary>
internal static class TreesBenchmark
{
    public sealed record TreeResult(
        string TreeId,
        int Cuts,
        int ReachableCuts,
        int ScheduledCuts,
        int EdgesPlannedLazy,
        int EdgesProbedLazy,
        int EdgesAllPairs,
        double PlanSecondsLazy,
        double PlanSecondsAllPairs,
        double ScheduleSecondsLazy,
        double ScheduleSecondsAllPairs,
        double ScheduleSecondsNaive,
        double TravelSecondsLazy,
        double TravelSecondsAllPairs,
        double TravelSecondsNaive,
        double ReplanMs);

    public sealed record Result(IReadOnlyList<TreeResult> Trees, MachineInfo Machine);

    /// <param name="denseCuts">When given, each tree gets cuts added up to this many (<see cref="DenseCuts"/>).</param>
    /// <param name="keepMoot">Keep moot cuts, distal first (<see cref="MootPolicy.CutFirst"/>), so a dense tree keeps more cuts to order.</param>
    public static Result Run(int trees, bool allPairs, int? denseCuts, bool keepMoot, Action<string>? progress, CancellationToken cancellationToken)
    {
        var arm = DemoArm.Create();
        var demo = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: Math.Max(1, (trees + 5) / 6)));
        var results = new List<TreeResult>();
        foreach (var tree in demo.Trees.Take(trees))
        {
            var scan = denseCuts is { } dense ? DenseCuts.WithCuts(tree.Scan, dense, DemoOrchardSettings.DefaultSeed) : tree.Scan;
            var lazySettings = Environment.GetEnvironmentVariable("ORCHARD_BENCH_DEBUG") is null ? SequencingSettings.Default : SequencingSettings.Default with { Trace = line => progress?.Invoke("    " + line) };
            lazySettings = keepMoot ? lazySettings with { Moot = MootPolicy.CutFirst } : lazySettings;
            var watch = Stopwatch.StartNew();
            var (lazy, state) = TreeSequencer.Plan(scan, arm, lazySettings, TimeProvider.System, cancellationToken);
            var lazySeconds = watch.Elapsed.TotalSeconds;
            var ls = lazy.Statistics;
            progress?.Invoke($"  plan: {ls.SolverRounds} rounds, {ls.ReachabilitySeconds:F2} s choosing stops ({ls.StandsAnalysed} stands), {ls.SolverSeconds:F2} s ordering, {ls.MovePlanningSeconds:F2} s moves ({ls.EdgesPlanned} planned, {ls.EdgesFailed} failed, {ls.EdgesProbed} probed), {lazy.Stops.Count} stops");

            double allPairsSeconds = double.NaN, allPairsSchedule = double.NaN, allPairsTravel = double.NaN;
            if (allPairs)
            {
                watch.Restart();
                var (full, _) = TreeSequencer.Plan(scan, arm, lazySettings with { Mode = EvaluationMode.AllPairs }, TimeProvider.System, cancellationToken);
                allPairsSeconds = watch.Elapsed.TotalSeconds;
                allPairsSchedule = full.TotalSeconds;
                allPairsTravel = full.TravelSeconds;
            }

            var naive = NaiveSweep.Run(scan, arm, state, lazy, lazySettings, cancellationToken);

            // A re-plan: the first two cuts done, the third missed and retried last, the arm at its pre-cut pose.
            var replanMs = double.NaN;
            var steps = lazy.AllSteps().ToArray();
            if (steps.Length >= 3)
            {
                var stopOfMissed = lazy.Stops.First(s => s.Steps.Any(x => x.CutId == steps[2].CutId));
                var request = new ReplanRequest(steps[2].PreCutConfiguration, steps.Take(2).Select(s => s.CutId).ToArray(), [], steps[2].CutId, RetryPolicy.RetryLast, stopOfMissed.ArmBase);
                watch.Restart();
                var traced = Environment.GetEnvironmentVariable("ORCHARD_BENCH_DEBUG") is null ? lazySettings : lazySettings with { Trace = line => progress?.Invoke("    " + line) };
                var (again, _) = TreeSequencer.Replan(scan, arm, state, request, 2, traced, TimeProvider.System, cancellationToken);
                replanMs = watch.Elapsed.TotalMilliseconds;
                var rs = again.Statistics;
                progress?.Invoke($"  re-plan: {again.TotalSeconds:F1} s schedule, {rs.SolverRounds} rounds, {rs.SolverSeconds * 1000:F0} ms ordering, {rs.MovePlanningSeconds * 1000:F0} ms moves, {rs.EdgesPlanned} planned, {rs.EdgesProbed} probed, {rs.EdgesReused} reused");
            }

            var result = new TreeResult(
                scan.TreeId, scan.Cuts.Count, state.Stands.SelectMany(s => s.Reachability).Where(r => r.IsReachable).Select(r => r.CutIndex).Distinct().Count(), lazy.StepCount,
                lazy.Statistics.EdgesPlanned, lazy.Statistics.EdgesProbed, lazy.Statistics.EdgesAllPairs,
                lazySeconds, allPairsSeconds, lazy.TotalSeconds, allPairsSchedule, naive.TotalSeconds,
                lazy.TravelSeconds, allPairsTravel, naive.TravelSeconds, replanMs);
            results.Add(result);
            progress?.Invoke($"{scan.TreeId}: {result.ScheduledCuts}/{result.Cuts} cuts, lazy {lazySeconds:F2} s → {lazy.TotalSeconds:F1} s schedule; all-pairs {allPairsSeconds:F2} s → {allPairsSchedule:F1} s; naive {naive.TotalSeconds:F1} s; re-plan {replanMs:F0} ms");
        }

        return new Result(results, MachineInfo.Current());
    }
}
