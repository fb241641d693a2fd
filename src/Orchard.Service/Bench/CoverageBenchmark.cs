using System.Diagnostics;
using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;

namespace Orchard.Service.Bench;

/// <summary>
/// Cut coverage over whole demo orchards: per tree, the cuts eligible for the machine (within the
/// shear's rating and not moot), how many a schedule takes, why the rest are left, the stops used and
/// the arm's time; totals per seed. The share that matters to an orchard is scheduled ÷ eligible.
/// </summary>
internal static class CoverageBenchmark
{
    public sealed record TreeResult(
        ulong Seed,
        string TreeId,
        int Cuts,
        int AboveShearRating,
        int Moot,
        int Eligible,
        int Scheduled,
        IReadOnlyDictionary<string, int> UnscheduledByReason,
        int Stops,
        int FarSideStops,
        double ArmSeconds,
        double TotalSeconds,
        double PlanSeconds,
        string Status,
        IReadOnlyList<string> Problems);

    public sealed record SeedTotals(
        ulong Seed,
        int Trees,
        int TreesWithNothingScheduled,
        int Eligible,
        int Scheduled,
        double CoverageShare,
        IReadOnlyDictionary<string, int> UnscheduledByReason,
        int Stops,
        double ArmSecondsPerTree,
        double MedianPlanSeconds,
        double MaxPlanSeconds);

    public sealed record Result(IReadOnlyList<TreeResult> Trees, IReadOnlyList<SeedTotals> Seeds, int EligibleTotal, int ScheduledTotal, double CoverageShare, MachineInfo Machine);

    public static Result Run(IReadOnlyList<ulong> seeds, int treesPerRow, SequencingSettings settings, Action<string>? progress, CancellationToken cancellationToken)
    {
        var arm = DemoArm.Create();
        var trees = new List<TreeResult>();
        foreach (var seed in seeds)
        {
            var demo = DemoOrchard.Generate(new DemoOrchardSettings(seed, treesPerRow));
            foreach (var tree in demo.Trees)
            {
                cancellationToken.ThrowIfCancellationRequested();
                var result = PlanOne(seed, tree.Scan, arm, settings, cancellationToken);
                trees.Add(result);
                progress?.Invoke($"seed {seed} {result.TreeId}: {result.Scheduled}/{result.Eligible} eligible cuts scheduled, {result.Stops} stop(s), arm {result.ArmSeconds:F1} s, planned in {result.PlanSeconds:F2} s"
                    + (result.UnscheduledByReason.Count == 0 ? string.Empty : "; left: " + string.Join(", ", result.UnscheduledByReason.Select(p => $"{p.Key} {p.Value}"))));
            }
        }

        var totals = trees.GroupBy(t => t.Seed).Select(g => new SeedTotals(
            g.Key,
            g.Count(),
            g.Count(t => t.Eligible > 0 && t.Scheduled == 0),
            g.Sum(t => t.Eligible),
            g.Sum(t => t.Scheduled),
            Share(g.Sum(t => t.Scheduled), g.Sum(t => t.Eligible)),
            Merge(g.Select(t => t.UnscheduledByReason)),
            g.Sum(t => t.Stops),
            g.Average(t => t.ArmSeconds),
            BenchStatistics.Median(g.Select(t => t.PlanSeconds)),
            g.Max(t => t.PlanSeconds))).ToArray();
        var eligible = trees.Sum(t => t.Eligible);
        var scheduled = trees.Sum(t => t.Scheduled);
        return new Result(trees, totals, eligible, scheduled, Share(scheduled, eligible), MachineInfo.Current());
    }

    /// <summary>Plans one tree and counts its coverage.</summary>
    public static TreeResult PlanOne(ulong seed, TreeScan scan, ArmProfile arm, SequencingSettings settings, CancellationToken cancellationToken)
    {
        var standing = CutEligibility.Classify(scan, arm, new BranchTopology(scan));
        var eligible = standing.Where(s => s.Kind == CutStandingKind.Eligible).Select(s => scan.Cuts[s.CutIndex].Id).ToHashSet(StringComparer.Ordinal);
        var watch = Stopwatch.StartNew();
        var (schedule, _) = TreeSequencer.Plan(scan, arm, settings, TimeProvider.System, cancellationToken);
        var seconds = watch.Elapsed.TotalSeconds;
        var scheduled = schedule.AllSteps().Count(s => eligible.Contains(s.CutId));
        var left = schedule.Unscheduled.Where(u => eligible.Contains(u.CutId))
            .GroupBy(u => JsonName(u.Reason?.ToString() ?? u.Status.ToString()))
            .OrderBy(g => g.Key, StringComparer.Ordinal)
            .ToDictionary(g => g.Key, g => g.Count(), StringComparer.Ordinal);
        return new TreeResult(
            seed, scan.TreeId, scan.Cuts.Count,
            standing.Count(s => s.Kind == CutStandingKind.AboveShearRating),
            standing.Count(s => s.Kind == CutStandingKind.Moot),
            eligible.Count, scheduled, left,
            schedule.Stops.Count(s => s.Steps.Count > 0),
            schedule.Stops.Count(s => s.Steps.Count > 0 && s.Side == StopSide.Far),
            schedule.ArmSeconds, schedule.TotalSeconds, seconds, schedule.Status.ToString(),
            schedule.Problems.Select(p => $"{p.Code}: {p.Message}").ToArray());
    }

    private static string JsonName(string name) => char.ToLowerInvariant(name[0]) + name[1..];

    private static double Share(int part, int whole) => whole == 0 ? 1 : (double)part / whole;

    private static Dictionary<string, int> Merge(IEnumerable<IReadOnlyDictionary<string, int>> counts)
    {
        var merged = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var (key, value) in counts.SelectMany(c => c))
        {
            merged[key] = merged.GetValueOrDefault(key) + value;
        }

        return merged;
    }
}
