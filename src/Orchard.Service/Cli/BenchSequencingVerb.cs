using System.Diagnostics;
using System.Globalization;
using Orchard.Core.Sequencing;
using Orchard.Core.Sequencing.Tsplib;
using Orchard.Core.Serialization;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>bench sequencing [--tsplib DIR]</c> (DIR defaults to the repository's tests/data/tsplib): solves every <c>.tsp</c>/<c>.atsp</c> file in DIR as a closed tour and
/// as an open path from node 1 under a time limit, and sets the lengths against DIR/optima.csv
/// (<c>instance,optimum</c>). The open path has no published optimum; it is checked against the bounds
/// closed optimum − longest edge ≤ open optimum ≤ (optimal tour − its longer edge at node 1; for an
/// asymmetric instance only the edge into node 1 can be dropped), the upper one when DIR has the
/// instance's <c>.opt.tour</c>.
/// </summary>
internal static class BenchSequencingVerb
{
    public const double DefaultSeconds = 2;

    public static async Task<int> RunAsync(IEnumerable<string> words, TextWriter stdout, CancellationToken cancellationToken)
    {
        var args = new CliArguments(words, new HashSet<string>());
        var directory = args.Text("tsplib") ?? RepositoryData.TsplibFolder()
            ?? throw new UsageException("bench sequencing needs --tsplib DIR outside a checkout (it reads the repository's tests/data/tsplib by default).");
        var jsonPath = args.Text("json");
        var seconds = args.Double("seconds", DefaultSeconds, 0.01, 3600);
        var strategyText = args.Text("first-solution");
        var solutionLimit = args.Text("solution-limit") is null ? (long?)null : args.Int("solution-limit", 0, 1, int.MaxValue);
        args.RejectUnknown();
        if (args.Positional.Count > 0)
        {
            throw new UsageException($"bench sequencing does not take '{string.Join(' ', args.Positional)}'.");
        }

        var strategy = TourFirstSolutionStrategy.PathCheapestArc;
        if (strategyText is not null && !Enum.TryParse(strategyText, ignoreCase: true, out strategy))
        {
            throw new UsageException($"--first-solution takes one of {string.Join(", ", Enum.GetNames<TourFirstSolutionStrategy>())}; got '{strategyText}'.");
        }

        if (!Directory.Exists(directory))
        {
            throw new UsageException($"--tsplib: no folder '{Path.GetFullPath(directory)}'.");
        }

        var optimaPath = Path.Combine(directory, "optima.csv");
        if (!File.Exists(optimaPath))
        {
            throw new UsageException($"--tsplib: '{Path.GetFullPath(optimaPath)}' does not exist (instance,optimum).");
        }

        await stdout.WriteLineAsync($"TSPLIB instances from {Path.GetFullPath(directory)}.");
        var optima = ReadOptima(await File.ReadAllLinesAsync(optimaPath, cancellationToken));
        var files = Directory.EnumerateFiles(directory)
            .Where(f => f.EndsWith(".tsp", StringComparison.Ordinal) || f.EndsWith(".atsp", StringComparison.Ordinal))
            .Order(StringComparer.Ordinal)
            .ToList();
        var settings = new TourSolverSettings(TimeSpan.FromSeconds(seconds), solutionLimit, strategy);

        var rows = new List<BenchRow>();
        var failures = new List<string>();
        foreach (var file in files)
        {
            var name = Path.GetFileNameWithoutExtension(file);
            try
            {
                var instance = TsplibParser.Parse(await File.ReadAllTextAsync(file, cancellationToken));
                var tourPath = Path.Combine(directory, name + ".opt.tour");
                var optimalTour = File.Exists(tourPath) ? TsplibParser.ParseTour(await File.ReadAllTextAsync(tourPath, cancellationToken)) : null;
                rows.Add(Run(name, instance, optima.GetValueOrDefault(name), optimalTour, settings, cancellationToken));
            }
            catch (Exception ex) when (ex is FormatException or NotSupportedException or ArgumentException)
            {
                failures.Add($"{name}: {ex.Message}");
            }
        }

        Print(rows, failures, settings, stdout);
        if (jsonPath is not null)
        {
            var report = new BenchReport(seconds, solutionLimit, strategy.ToString(), rows);
            await CliFiles.WriteTextAsync(jsonPath, OrchardJson.Serialize(report, indented: true) + "\n", "--json", stdout, cancellationToken);
        }

        return failures.Count == 0 ? 0 : 1;
    }

    private static BenchRow Run(string name, TsplibInstance instance, long? optimum, TsplibTour? optimalTour, TourSolverSettings settings, CancellationToken cancellationToken)
    {
        var clock = Stopwatch.StartNew();
        var closed = TourSolver.Solve(instance.ToProblem(TourKind.Closed), settings, cancellationToken);
        var closedSeconds = clock.Elapsed.TotalSeconds;
        clock.Restart();
        var open = TourSolver.Solve(instance.ToProblem(TourKind.Open), settings, cancellationToken);
        var openSeconds = clock.Elapsed.TotalSeconds;

        long? lower = optimum is { } opt ? opt - instance.LongestEdge() : null;
        long? upper = null;
        if (optimalTour is not null && optimalTour.Nodes.Count == instance.Dimension)
        {
            // Drop one edge at node 1 (node 0 here) from the optimal tour: what is left is an open path from it.
            var nodes = optimalTour.Nodes;
            var at = IndexOf(nodes, 0);
            var before = nodes[(at + nodes.Count - 1) % nodes.Count];
            var after = nodes[(at + 1) % nodes.Count];
            var dropped = instance.IsSymmetric ? Math.Max(instance.Distance(before, 0), instance.Distance(0, after)) : instance.Distance(before, 0);
            upper = instance.ClosedTourLength(nodes) - dropped;
        }

        double? gap = optimum is { } o && o > 0 ? 100.0 * (closed.TotalCost - o) / o : null;
        return new BenchRow(
            name, instance.Type, instance.Dimension, optimum, closed.TotalCost, gap, open.TotalCost, lower, upper,
            Math.Round(closedSeconds + openSeconds, 3), Math.Round(closedSeconds, 3), Math.Round(openSeconds, 3),
            closed.Statistics.SolutionsFound, open.Statistics.SolutionsFound);
    }

    private static int IndexOf(IReadOnlyList<int> nodes, int node)
    {
        for (var i = 0; i < nodes.Count; i++)
        {
            if (nodes[i] == node)
            {
                return i;
            }
        }

        return -1;
    }

    private static Dictionary<string, long> ReadOptima(string[] lines)
    {
        var optima = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var line in lines.Skip(1).Where(l => l.Trim().Length > 0))
        {
            var parts = line.Split(',');
            if (parts.Length != 2 || !long.TryParse(parts[1].Trim(), NumberStyles.Integer, CultureInfo.InvariantCulture, out var optimum))
            {
                throw new UsageException($"optima.csv: '{line}' is not 'instance,optimum'.");
            }

            optima[parts[0].Trim()] = optimum;
        }

        return optima;
    }

    private static void Print(List<BenchRow> rows, List<string> failures, TourSolverSettings settings, TextWriter stdout)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout), Ansi = AnsiSupport.Detect, ColorSystem = ColorSystemSupport.Detect });
        console.Profile.Width = Math.Max(console.Profile.Width, 120); // The table is wider than a redirected console's default 80.
        var limits = settings.SolutionLimit is { } cap ? $"{settings.TimeLimit!.Value.TotalSeconds:G} s or {cap} solutions" : $"{settings.TimeLimit!.Value.TotalSeconds:G} s";
        console.MarkupLine($"[bold]Sequencing on TSPLIB[/]: OR-Tools routing, {Markup.Escape(settings.FirstSolution.ToString())} then guided local search, {limits} per solve.");
        var table = new Table().Border(TableBorder.Rounded)
            .AddColumn("Instance").AddColumn(new TableColumn("n").RightAligned())
            .AddColumn(new TableColumn("Optimum").RightAligned()).AddColumn(new TableColumn("Closed").RightAligned())
            .AddColumn(new TableColumn("Gap %").RightAligned()).AddColumn(new TableColumn("Open").RightAligned())
            .AddColumn(new TableColumn("Open bounds").RightAligned()).AddColumn(new TableColumn("Solutions").RightAligned())
            .AddColumn(new TableColumn("Seconds").RightAligned());
        foreach (var r in rows)
        {
            var bounds = $"{Text(r.OpenLowerBound)} … {Text(r.OpenUpperBound)}";
            var open = r.OpenLowerBound is { } low && r.OpenLength < low ? $"[red]{r.OpenLength} below bound[/]" : r.OpenLength.ToString(CultureInfo.InvariantCulture);
            table.AddRow(
                Markup.Escape(r.Instance), r.Nodes.ToString(CultureInfo.InvariantCulture), Text(r.Optimum), r.ClosedLength.ToString(CultureInfo.InvariantCulture),
                r.ClosedGapPercent is { } g ? g.ToString("F2", CultureInfo.InvariantCulture) : "—", open, bounds,
                $"{r.ClosedSolutions}/{r.OpenSolutions}", r.Seconds.ToString("F2", CultureInfo.InvariantCulture));
        }

        console.Write(table);
        var gaps = rows.Where(r => r.ClosedGapPercent is not null).Select(r => r.ClosedGapPercent!.Value).ToList();
        if (gaps.Count > 0)
        {
            console.MarkupLine($"Closed-tour gap: mean {gaps.Average():F2} %, worst {gaps.Max():F2} %. Open bounds: closed optimum − longest edge … optimal tour − its longer edge at node 1 (— without a .opt.tour).");
        }

        foreach (var failure in failures)
        {
            console.MarkupLine($"[red]Skipped[/] {Markup.Escape(failure)}");
        }
    }

    private static string Text(long? value) => value is { } v ? v.ToString(CultureInfo.InvariantCulture) : "—";

    private sealed record BenchReport(double SecondsPerSolve, long? SolutionLimit, string FirstSolution, IReadOnlyList<BenchRow> Instances);

    private sealed record BenchRow(
        string Instance,
        string Type,
        int Nodes,
        long? Optimum,
        long ClosedLength,
        double? ClosedGapPercent,
        long OpenLength,
        long? OpenLowerBound,
        long? OpenUpperBound,
        double Seconds,
        double ClosedSeconds,
        double OpenSeconds,
        long ClosedSolutions,
        long OpenSolutions);
}
