using Orchard.Core.Serialization;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary><c>bench moves [--trees N] [--verify] [--json FILE]</c>: every planner variant on the same demo moves.</summary>
internal static class BenchMovesVerb
{
    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var trees = args.Int("trees", 4, 1, 200);
        var verify = args.Flag("verify");
        var json = args.Text("json");
        args.RejectUnknown();

        var result = MovesBenchmark.Run(trees, verify, line => stdout.WriteLine(line), cancellationToken);
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 160);
        var rrt = result.Variants.First(v => v.Name == "rrt-connect");
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Variant");
        foreach (var column in new[] { "Success", "of solvable", "Median ms", "p95 ms", "Checks", "× RRT checks", "Exec s", "× RRT exec", "Path rad", "Min clearance mm" })
        {
            table.AddColumn(new TableColumn(column).RightAligned());
        }

        if (verify)
        {
            table.AddColumn(new TableColumn("Dense bad / samples").RightAligned());
        }

        foreach (var v in result.Variants)
        {
            var cells = new List<string>
            {
                v.Name, $"{v.SuccessRate:P1}", $"{v.SuccessOfSolvable:P1}", $"{v.MedianPlanMs:F3}", $"{v.P95PlanMs:F2}", $"{v.MeanCollisionChecks:F0}",
                $"{v.MeanCollisionChecks / rrt.MeanCollisionChecks:F2}", $"{v.MeanExecutionSeconds:F2}", $"{v.MeanExecutionSeconds / rrt.MeanExecutionSeconds:F2}",
                $"{v.MeanPathLengthRad:F2}", $"{v.MinClearanceM * 1000:F1}",
            };
            if (verify)
            {
                cells.Add($"{v.DenseBadSamples} / {v.DenseSamples:N0}");
            }

            table.AddRow(cells.ToArray());
        }

        console.MarkupLine($"bench moves: {result.Moves} moves on {result.Trees} demo trees ({result.SolvableByAny} solved by some variant), {(result.Machine.Release ? "Release" : "Debug")} build:");
        console.Write(table);
        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, OrchardJson.Serialize(result, indented: true) + "\n", "--json", stdout, cancellationToken);
        }

        return 0;
    }
}
