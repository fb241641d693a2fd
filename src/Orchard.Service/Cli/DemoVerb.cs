using System.Globalization;
using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Validation;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary><c>demo</c>: plan the invented orchard through the service and serve it; <c>demo summary</c>; <c>demo export DIR</c>.</summary>
internal static class DemoVerb
{
    public static async Task<int> RunAsync(IEnumerable<string> words, TextWriter stdout, CancellationToken cancellationToken)
    {
        var args = new CliArguments(words, new HashSet<string>());
        var settings = new DemoOrchardSettings(
            args.UInt64("seed", DemoOrchardSettings.DefaultSeed),
            args.Int("trees-per-row", 4, 1, DemoOrchardSettings.MaxTreesPerRow));
        var urls = args.Text("urls") ?? "http://127.0.0.1:5080";
        var data = args.Text("data") ?? "data";
        args.RejectUnknown();

        var orchard = DemoOrchard.Generate(settings);
        var arm = DemoArm.Create();
        switch (args.Positional)
        {
            case []:
                return await DemoServe.RunAsync(settings, urls, data, stdout, cancellationToken);
            case ["summary"]:
                PrintSummary(orchard, arm.Tool.MaxCutDiameterMm, stdout);
                PrintPlanned(orchard, arm, settings.Seed, stdout, cancellationToken);
                return 0;
            case ["export", var directory]:
                var written = await DemoExporter.ExportAsync(orchard, arm, directory, cancellationToken);
                await stdout.WriteLineAsync($"Wrote {written.Count} files to {Path.GetFullPath(directory)} ({orchard.Trees.Count} tree scans, arm.json, orchard.json).");
                return 0;
            case ["export"]:
                throw new UsageException("demo export needs a folder to write to.");
            default:
                throw new UsageException($"demo does not take '{string.Join(' ', args.Positional)}'.");
        }
    }

    private static void PrintSummary(DemoOrchard orchard, double shearRatingMm, TextWriter stdout)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout), Ansi = AnsiSupport.Detect, ColorSystem = ColorSystemSupport.Detect });
        console.Profile.Width = Math.Max(console.Profile.Width, 120);
        console.MarkupLine($"[bold]{Markup.Escape(orchard.FarmName)}[/] (invented demo orchard): {orchard.Blocks.Count()} blocks, {orchard.Rows.Count} rows, {orchard.Trees.Count} scanned trees");

        var table = new Table().Border(TableBorder.Rounded)
            .AddColumn("Block").AddColumn("Row").AddColumn(new TableColumn("Spacing m").RightAligned())
            .AddColumn(new TableColumn("Trees").RightAligned()).AddColumn(new TableColumn("Cuts").RightAligned())
            .AddColumn(new TableColumn("Thin/head/back/renew").RightAligned())
            .AddColumn(new TableColumn($"> {shearRatingMm:G} mm").RightAligned())
            .AddColumn(new TableColumn("Err/warn").RightAligned());

        int trees = 0, cuts = 0, above = 0, errors = 0, warnings = 0;
        foreach (var row in orchard.Rows)
        {
            var rowTrees = orchard.Trees.Where(t => t.Row == row).ToList();
            var rowCuts = rowTrees.SelectMany(t => t.Scan.Cuts).ToList();
            var byKind = string.Join('/', Enum.GetValues<CutKind>().Select(k => rowCuts.Count(c => c.Kind == k)));
            var rowAbove = rowCuts.Count(c => c.DiameterMm > shearRatingMm);
            var reports = rowTrees.Select(t => TreeScanValidator.Validate(t.Scan, shearRatingMm: shearRatingMm)).ToList();
            var rowErrors = reports.Sum(r => r.Errors.Count);
            var rowWarnings = reports.Sum(r => r.Warnings.Count);
            table.AddRow(
                Markup.Escape(row.Block), row.Name, $"{row.InRowSpacingM:F2} × {row.RowSpacingM:F2}",
                rowTrees.Count.ToString(), rowCuts.Count.ToString(), byKind,
                rowAbove.ToString(), $"{rowErrors}/{rowWarnings}");
            trees += rowTrees.Count;
            cuts += rowCuts.Count;
            above += rowAbove;
            errors += rowErrors;
            warnings += rowWarnings;
        }

        table.AddEmptyRow();
        table.AddRow("[bold]All[/]", string.Empty, string.Empty, trees.ToString(), cuts.ToString(), string.Empty, above.ToString(), $"{errors}/{warnings}");
        console.Write(table);
        var perTree = orchard.Trees.Select(t => t.Scan.Cuts.Count).ToList();
        console.MarkupLine($"Cuts per tree: min {perTree.Min()}, median {Median(perTree)}, max {perTree.Max()}.");
    }

    /// <summary>Plans every tree as the service would and says, per row, how much of the work the machine takes; trees with nothing scheduled are counted apart, with their reason.</summary>
    private static void PrintPlanned(DemoOrchard orchard, ArmProfile arm, ulong seed, TextWriter stdout, CancellationToken cancellationToken)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout), Ansi = AnsiSupport.Detect, ColorSystem = ColorSystemSupport.Detect });
        console.Profile.Width = Math.Max(console.Profile.Width, 120);
        var planned = new List<(DemoRow Row, CoverageBenchmark.TreeResult Result)>();
        foreach (var tree in orchard.Trees)
        {
            cancellationToken.ThrowIfCancellationRequested();
            planned.Add((tree.Row, CoverageBenchmark.PlanOne(seed, tree.Scan, arm, SequencingSettings.Default, cancellationToken)));
            console.Write($"\rPlanning the demo trees: {planned.Count}/{orchard.Trees.Count}");
        }

        console.WriteLine();
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Row");
        foreach (var column in new[] { "Trees", "Nothing scheduled", "Eligible cuts", "Scheduled", "Share", "Stops (far side)", "Arm min" })
        {
            table.AddColumn(new TableColumn(column).RightAligned());
        }

        foreach (var group in planned.GroupBy(p => p.Row.Name).Append(planned.GroupBy(_ => "All").Single()))
        {
            var results = group.Select(g => g.Result).ToList();
            var eligible = results.Sum(r => r.Eligible);
            var scheduled = results.Sum(r => r.Scheduled);
            table.AddRow(group.Key, results.Count.ToString(CultureInfo.InvariantCulture), results.Count(r => r.Eligible > 0 && r.Scheduled == 0).ToString(CultureInfo.InvariantCulture),
                eligible.ToString(CultureInfo.InvariantCulture), scheduled.ToString(CultureInfo.InvariantCulture), $"{(double)scheduled / Math.Max(1, eligible):P0}",
                $"{results.Sum(r => r.Stops)} ({results.Sum(r => r.FarSideStops)})", $"{results.Sum(r => r.ArmSeconds) / 60:F1}");
        }

        console.MarkupLine("Planned as the service plans them (stops chosen along the row and on both sides); eligible cuts are within the shear's rating and not made moot by another cut:");
        console.Write(table);
        foreach (var (_, result) in planned.Where(p => p.Result.Eligible > 0 && p.Result.Scheduled == 0))
        {
            console.MarkupLine($"  [bold]{Markup.Escape(result.TreeId)}[/]: nothing scheduled — {Markup.Escape(string.Join("; ", result.Problems.DefaultIfEmpty("see its schedule's unscheduled cuts")))}");
        }

        var left = planned.SelectMany(p => p.Result.UnscheduledByReason).GroupBy(p => p.Key).Select(g => $"{g.Key} {g.Sum(p => p.Value)}");
        console.MarkupLine($"Eligible cuts left to the hand crew, by reason: {Markup.Escape(string.Join(", ", left.DefaultIfEmpty("none")))}.");
    }

    private static double Median(List<int> values)
    {
        var sorted = values.Order().ToList();
        return sorted.Count % 2 == 1 ? sorted[sorted.Count / 2] : (sorted[(sorted.Count / 2) - 1] + sorted[sorted.Count / 2]) / 2.0;
    }
}
