using Orchard.Core.Serialization;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary><c>bench trees [--trees N] [--dense N] [--keep-moot] [--no-all-pairs] [--json FILE]</c>: scan → schedule on demo trees.</summary>
internal static class BenchTreesVerb
{
    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var trees = args.Int("trees", 6, 1, 500);
        var allPairs = !args.Flag("no-all-pairs");
        var keepMoot = args.Flag("keep-moot");
        var dense = args.Text("dense") is null ? (int?)null : args.Int("dense", 40, 1, 500);
        var json = args.Text("json");
        args.RejectUnknown();

        var result = TreesBenchmark.Run(trees, allPairs, dense, keepMoot, line => stdout.WriteLine(line), cancellationToken);
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 200);
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Tree");
        foreach (var column in new[] { "Cuts", "Reach", "Sched", "Lazy planned+probed", "All pairs", "Share", "Lazy s", "All-pairs s", "Sched lazy s", "Sched all-pairs s", "Sched naive s", "Travel lazy/naive", "Re-plan ms" })
        {
            table.AddColumn(new TableColumn(column).RightAligned());
        }

        foreach (var t in result.Trees)
        {
            table.AddRow(t.TreeId, t.Cuts.ToString(), t.ReachableCuts.ToString(), t.ScheduledCuts.ToString(), $"{t.EdgesPlannedLazy}+{t.EdgesProbedLazy}", t.EdgesAllPairs.ToString(),
                $"{(double)(t.EdgesPlannedLazy + t.EdgesProbedLazy) / t.EdgesAllPairs:P1}", $"{t.PlanSecondsLazy:F2}", $"{t.PlanSecondsAllPairs:F2}", $"{t.ScheduleSecondsLazy:F1}",
                $"{t.ScheduleSecondsAllPairs:F1}", $"{t.ScheduleSecondsNaive:F1}", $"{t.TravelSecondsLazy / t.TravelSecondsNaive:F2}", $"{t.ReplanMs:F0}");
        }

        console.Write(table);
        var rows = result.Trees;
        console.MarkupLine($"Medians: lazy plan {BenchStatistics.Median(rows.Select(t => t.PlanSecondsLazy)):F2} s (max {rows.Max(t => t.PlanSecondsLazy):F2} s), cuts {BenchStatistics.Median(rows.Select(t => (double)t.Cuts)):F0}, re-plan {BenchStatistics.Median(rows.Select(t => t.ReplanMs)):F0} ms (max {rows.Max(t => t.ReplanMs):F0} ms), travel lazy/naive {BenchStatistics.Median(rows.Select(t => t.TravelSecondsLazy / t.TravelSecondsNaive)):F2}, schedule lazy/all-pairs {BenchStatistics.Median(rows.Select(t => t.ScheduleSecondsLazy / t.ScheduleSecondsAllPairs)):F3}.");
        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, BenchJson.Text(result), "--json", stdout, cancellationToken);
        }

        return 0;
    }
}
