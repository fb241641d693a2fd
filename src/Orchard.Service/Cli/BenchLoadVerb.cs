using System.Globalization;
using Orchard.Core.Serialization;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>bench load [--get-rate N] [--post-rate N] [--seconds N] [--warmup-seconds N] [--connections N]
/// [--seed-trees N] [--postgres CONN] [--baseline ORCHARD_DLL] [--json FILE]</c>: fixed-rate load on
/// loopback against an API process; with <c>--baseline</c>, the same run against another build first and
/// the ratios of the two.
/// </summary>
internal static class BenchLoadVerb
{
    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var settings = new LoadSettings(
            PostgresConnectionString: args.Text("postgres"),
            GetPerSecond: args.Int("get-rate", 3000, 1, 100_000),
            PostPerSecond: args.Int("post-rate", 100, 1, 10_000),
            Duration: TimeSpan.FromSeconds(args.Int("seconds", 20, 1, 3600)),
            Warmup: TimeSpan.FromSeconds(args.Int("warmup-seconds", 5, 1, 600)),
            Connections: args.Int("connections", 32, 1, 1024),
            SeedTrees: args.Int("seed-trees", 4, 1, 24));
        var baseline = args.Text("baseline");
        var json = args.Text("json");
        args.RejectUnknown();
        if (baseline is not null && !File.Exists(baseline))
        {
            throw new UsageException($"--baseline needs the path of another build's orchard.dll; '{Path.GetFullPath(baseline)}' does not exist.");
        }

        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 160);
        var reports = new List<LoadReport>();
        if (baseline is not null)
        {
            stdout.WriteLine($"baseline: {Path.GetFullPath(baseline)}");
            reports.Add(await LoadBenchmark.RunAsync(settings with { ServerAssembly = baseline }, line => stdout.WriteLine(line), cancellationToken));
            stdout.WriteLine("this build:");
        }

        reports.Add(await LoadBenchmark.RunAsync(settings, line => stdout.WriteLine(line), cancellationToken));
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Server").AddColumn("Phase");
        foreach (var column in new[] { "Offered/s", "Achieved/s", "Sent", "Errors", "Error rate", "p50 ms", "p95 ms", "p99 ms", "max ms", "Peak MiB" })
        {
            table.AddColumn(new TableColumn(column).RightAligned());
        }

        foreach (var report in reports)
        {
            foreach (var p in report.Phases)
            {
                table.AddRow(Markup.Escape(report.Server == "this build" ? "this build" : "baseline"), p.Name, F(p.TargetPerSecond, 0), F(p.AchievedPerSecond, 0), p.Sent.ToString(CultureInfo.InvariantCulture),
                    p.Errors.ToString(CultureInfo.InvariantCulture), p.ErrorRate.ToString("P2", CultureInfo.InvariantCulture), F(p.LatencyP50Ms, 2), F(p.LatencyP95Ms, 2), F(p.LatencyP99Ms, 2),
                    F(p.LatencyMaxMs, 1), F(report.ApiPeakResidentMiB ?? double.NaN, 0));
            }
        }

        console.Write(table);
        var current = reports[^1];
        console.MarkupLine(Markup.Escape(
            $"Store {current.Store}; {current.Connections} connections; schedule body {current.ScheduleBytes:N0} B, scan body {current.ScanBytes:N0} B; " +
            "latency counts from each request's due time; peak memory is the API process's VmHWM."));
        if (reports.Count == 2)
        {
            foreach (var (before, after) in reports[0].Phases.Zip(current.Phases))
            {
                console.MarkupLine(Markup.Escape(
                    $"{after.Name}, this build / baseline: p50 {after.LatencyP50Ms / before.LatencyP50Ms:F2}×, p99 {after.LatencyP99Ms / before.LatencyP99Ms:F2}×, achieved {after.AchievedPerSecond / before.AchievedPerSecond:F2}×"));
            }
        }

        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, BenchJson.Text(reports), "--json", stdout, cancellationToken);
        }

        return reports.All(r => r.Phases.All(p => p.Errors == 0)) ? 0 : 1;
    }

    private static string F(double value, int digits) => value.ToString("F" + digits.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
}
