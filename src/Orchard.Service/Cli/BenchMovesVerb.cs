using Orchard.Core.Serialization;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary><c>bench moves [--trees N] [--endpoints clear|pre-cut] [--planners A,B] [--verify] [--json FILE]</c>: every planner variant on the same demo moves.</summary>
internal static class BenchMovesVerb
{
    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var trees = args.Int("trees", 4, 1, 200);
        var verify = args.Flag("verify");
        var json = args.Text("json");
        var endpoints = args.Text("endpoints") ?? "clear";
        var only = args.Text("planners")?.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
        args.RejectUnknown();
        var names = MovesBenchmark.Planners().Select(p => p.Name).ToList();
        if (only?.FirstOrDefault(n => !names.Contains(n)) is { } unknown)
        {
            throw new UsageException($"--planners: no variant '{unknown}'; there are: {string.Join(", ", names)}.");
        }

        if (endpoints is not ("clear" or "pre-cut"))
        {
            throw new UsageException("--endpoints takes clear or pre-cut.");
        }

        var result = MovesBenchmark.Run(trees, verify, endpoints == "clear", only, line => stdout.WriteLine(line), cancellationToken);
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 200);
        var rrt = result.Variants.First(v => v.Name == "rrt-connect");
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Variant (fastest execution first)");
        foreach (var column in new[] { "Success", "+ via stow", "Median ms", "p95 ms", "Checks", "of them shortcut", "on failed moves", "× RRT checks", "Exec s", "× RRT exec (common)", "Exec s before", "Blocked: now ÷ before", "Corners now / before", "Path rad", "Min clearance mm" })
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
                v.Name, $"{v.SuccessRate:P1}", $"{v.SuccessViaStowRate:P1}", $"{v.MedianPlanMs:F2}", $"{v.P95PlanMs:F1}", $"{v.MeanCollisionChecks:F0}", $"{v.MeanShortcutChecks:F0}", $"{v.FailedChecksShare:P0}",
                $"{v.MeanCollisionChecks / rrt.MeanCollisionChecks:F2}", $"{v.MeanExecutionSeconds:F2}", $"{v.ExecutionVsRrtOnCommon:F2}", $"{v.MeanExecutionSecondsPrevious:F2}",
                $"{v.BlockedExecutionRatio:F2} ({v.BlockedSolvedBoth})", $"{v.MeanCorners:F1} / {v.MeanCornersPrevious:F1}", $"{v.MeanPathLengthRad:F2}", $"{v.MinClearanceM * 1000:F1}",
            };
            if (verify)
            {
                cells.Add($"{v.DenseBadSamples} / {v.DenseSamples:N0}");
            }

            table.AddRow(cells.ToArray());
        }

        console.MarkupLine($"bench moves: {result.Moves} moves between {result.Endpoints} on {result.Trees} demo trees ({result.Blocked} with the straight line blocked; {result.SolvableByAny} solved by some variant; {result.SolvableViaStow} that a variant missed it made through stow), {(result.Machine.Release ? "Release" : "Debug")} build.");
        console.MarkupLine("Success counts every move. \"Before\": the same planner as the previous build ran it (no final visibility pass, a stop at every waypoint), same moves and seeds. Execution is the emitted trajectory's (corners blended and proven free).");
        console.Write(table);
        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, BenchJson.Text(result), "--json", stdout, cancellationToken);
        }

        return 0;
    }
}
