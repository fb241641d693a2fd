using Orchard.Core.Collision;
using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Reachability;
using Orchard.Core.Validation;
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
                PrintReachability(orchard, arm, stdout, cancellationToken);
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

    private static void PrintReachability(DemoOrchard orchard, ArmProfile arm, TextWriter stdout, CancellationToken cancellationToken)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout), Ansi = AnsiSupport.Detect, ColorSystem = ColorSystemSupport.Detect });
        console.Profile.Width = Math.Max(console.Profile.Width, 120);
        var reasons = Enum.GetValues<UnreachableReason>();
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Row").AddColumn(new TableColumn("Cuts").RightAligned()).AddColumn(new TableColumn("Reachable").RightAligned());
        foreach (var reason in reasons)
        {
            table.AddColumn(new TableColumn(ReasonLabel(reason)).RightAligned());
        }

        var results = orchard.Trees
            .AsParallel().AsOrdered().WithCancellation(cancellationToken)
            .Select(t => (t.Row, Cuts: ReachabilityAnalyzer.Analyze(new WorkCell(t.Scan, arm), ReachabilitySettings.Default, DemoOrchardSettings.DefaultSeed, cancellationToken)))
            .ToList();
        foreach (var group in results.GroupBy(r => r.Row.Name).Append(results.GroupBy(_ => "All").Single()))
        {
            var cuts = group.SelectMany(g => g.Cuts).ToList();
            var reachable = cuts.Count(c => c.IsReachable);
            var row = new List<string> { group.Key, cuts.Count.ToString(), $"{reachable} ({100.0 * reachable / Math.Max(1, cuts.Count):F0} %)" };
            row.AddRange(reasons.Select(r => cuts.Count(c => c.Reason == r).ToString()));
            table.AddRow(row.ToArray());
        }

        console.MarkupLine("Reachability of the cuts from each tree's platform stand, demo arm:");
        console.Write(table);
    }

    private static string ReasonLabel(UnreachableReason reason) => reason switch
    {
        UnreachableReason.AboveShearRating => "Too thick",
        UnreachableReason.OutOfReach => "Out of reach",
        UnreachableReason.JointLimits => "Joint limits",
        _ => "Collision",
    };

    private static double Median(List<int> values)
    {
        var sorted = values.Order().ToList();
        return sorted.Count % 2 == 1 ? sorted[sorted.Count / 2] : (sorted[(sorted.Count / 2) - 1] + sorted[sorted.Count / 2]) / 2.0;
    }
}
