using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>plan FILE [--arm FILE] [--format json|table] [--mode lazy|all-pairs] [--probe K] [--trace]</c>:
/// plans one scan offline and prints its schedule.
/// </summary>
internal static class PlanVerb
{
    public static async Task<int> RunAsync(IEnumerable<string> words, TextWriter stdout, TextWriter stderr, CancellationToken cancellationToken)
    {
        var args = new CliArguments(words, new HashSet<string> { "trace" });
        var armFile = args.Text("arm");
        var format = args.Text("format") ?? "table";
        var mode = args.Text("mode") ?? "lazy";
        var settings = SequencingSettings.Default with
        {
            Mode = mode switch
            {
                "lazy" => EvaluationMode.Lazy,
                "all-pairs" => EvaluationMode.AllPairs,
                _ => throw new UsageException("--mode takes lazy or all-pairs."),
            },
            ProbeNeighbours = args.Int("probe", SequencingSettings.Default.ProbeNeighbours, 0, 1000),
        };
        if (args.Flag("trace"))
        {
            settings = settings with { Trace = line => stderr.WriteLine(line) };
        }
        args.RejectUnknown();
        if (format is not ("json" or "table"))
        {
            throw new UsageException("--format takes json or table.");
        }

        if (args.Positional is not [var scanFile])
        {
            throw new UsageException("plan needs one scan file.");
        }

        var scan = await ReadAsync<TreeScan>(scanFile, "scan", stderr, cancellationToken);
        var arm = armFile is null ? DemoArm.Create() : await ReadAsync<ArmProfile>(armFile, "--arm", stderr, cancellationToken);
        if (scan is null || arm is null)
        {
            return 1;
        }

        var armReport = ArmProfileValidator.Validate(arm);
        var scanReport = TreeScanValidator.Validate(scan, shearRatingMm: arm.Tool.MaxCutDiameterMm);
        foreach (var problem in armReport.Problems.Select(p => ("arm", p)).Concat(scanReport.Problems.Select(p => ("scan", p))))
        {
            var file = Path.GetFullPath(problem.Item1 == "arm" ? armFile! : scanFile);
            await stderr.WriteLineAsync($"{problem.Item1} {file} {problem.p.Severity.ToString().ToLowerInvariant()} at {problem.p.Path}: {problem.p.Message}");
        }

        if (!armReport.IsValid || !scanReport.IsValid)
        {
            return 1;
        }

        var (schedule, _) = TreeSequencer.Plan(scan, arm, settings, TimeProvider.System, cancellationToken);
        if (format == "json")
        {
            await stdout.WriteLineAsync(OrchardJson.Serialize(schedule, indented: true));
            return 0;
        }

        PrintTable(schedule, stdout);
        return 0;
    }

    private static async Task<T?> ReadAsync<T>(string file, string what, TextWriter stderr, CancellationToken cancellationToken)
        where T : class
    {
        var parsed = OrchardJson.Parse<T>(await CliFiles.ReadTextAsync(file, what, cancellationToken));
        foreach (var problem in parsed.Problems)
        {
            await stderr.WriteLineAsync($"orchard: {what} {Path.GetFullPath(file)} at {problem.Path}: {problem.Message}");
        }

        return parsed.Value;
    }

    private static void PrintTable(Schedule schedule, TextWriter stdout)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 120);
        console.MarkupLine($"Schedule for tree [bold]{Markup.Escape(schedule.TreeId)}[/] v{schedule.Version} ({schedule.Status.ToString().ToLowerInvariant()}), arm {Markup.Escape(schedule.ArmProfileId)}: "
            + $"{schedule.StepCount} cuts from {schedule.Stops.Count} stop(s), {schedule.TotalSeconds:F1} s in all ({schedule.ArmSeconds:F1} s of arm work, {schedule.PlatformSeconds:F1} s moving the platform).");
        foreach (var problem in schedule.Problems)
        {
            console.MarkupLine($"[bold]Tree problem[/] {Markup.Escape(problem.Code)}: {Markup.Escape(problem.Message)}");
        }

        foreach (var stop in schedule.Stops)
        {
            var side = stop.Side == StopSide.Near ? "near side" : "far side (the next alley's pass)";
            console.MarkupLine($"[bold]Stop {stop.Sequence}[/], {side}: {stop.AlongRowOffsetM:+0.00;-0.00;0.00} m along the row and {stop.IntoAlleyOffsetM:+0.00;-0.00;0.00} m into the alley from the tablet's stand"
                + $" (base at x {stop.ArmBase.PositionM.X:F2}, y {stop.ArmBase.PositionM.Y:F2} m); platform move {stop.PlatformMoveSeconds:F1} s; starts at {stop.StartSecond:F1} s"
                + (stop.Retreat.Count > 0 ? $"; retreat {stop.RetreatSeconds:F2} s first" : string.Empty));
            var table = new Table().Border(TableBorder.Rounded).AddColumn("#").AddColumn("Cut");
            foreach (var column in new[] { "Start s", "Travel s", "Approach s", "Cut s", "Retract s", "Candidate", "Move", "Depends on" })
            {
                table.AddColumn(new TableColumn(column).RightAligned());
            }

            foreach (var step in stop.Steps)
            {
                table.AddRow(step.Sequence.ToString(), Markup.Escape(step.CutId), $"{step.StartSecond:F1}", $"{step.TravelSeconds:F2}", $"{step.ApproachSeconds:F2}",
                    $"{step.CutSeconds:F2}", $"{step.RetractSeconds:F2}", step.CandidateIndex.ToString(), step.TravelMethod, Markup.Escape(string.Join(" ", step.DependsOnCuts)));
            }

            console.Write(table);
            console.MarkupLine($"  back to stow: {stop.ReturnSeconds:F2} s ({Markup.Escape(stop.ReturnMethod)}), done at {stop.EndSecond:F1} s.");
        }

        foreach (var cut in schedule.Unscheduled)
        {
            var where = cut.NearestStop is { } k ? $" nearest stop {k};" : string.Empty;
            var shortfall = cut.ShortfallMm is { } mm ? $" short by {mm:F0} mm;" : string.Empty;
            var blocked = cut.BlockedBy is { } b ? $" blocked by {b};" : string.Empty;
            console.MarkupLine($"  {Markup.Escape(cut.CutId)}: {cut.Status}{(cut.Reason is null ? string.Empty : " (" + cut.Reason + ")")}{Markup.Escape(where + shortfall + blocked)} — {Markup.Escape(cut.Detail)}");
        }

        var s = schedule.Statistics;
        console.MarkupLine($"Planned {s.EdgesPlanned} moves ({s.EdgesFailed} failed) and probed {s.EdgesProbed} straight lines, of {s.EdgesAllPairs} all-pairs, {s.SolverRounds} solver rounds, {s.CandidateNodes} candidates, {s.StandsAnalysed} stands analysed; {s.PlanSeconds:F2} s ({s.ReachabilitySeconds:F2} s choosing stops, {s.SolverSeconds:F2} s ordering, {s.MovePlanningSeconds:F2} s moves), mode {s.Mode}.");
    }
}
