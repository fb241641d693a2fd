using System.Globalization;
using Orchard.Core.Serialization;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>bench load [--get-rate N] [--post-rate N] [--seconds N] [--warmup-seconds N] [--connections N]
/// [--seed-trees N] [--postgres CONN] [--json FILE]</c>: fixed-rate load on loopback against an API process.
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
        var json = args.Text("json");
        args.RejectUnknown();

        var report = await LoadBenchmark.RunAsync(settings, line => stdout.WriteLine(line), cancellationToken);
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 160);
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Phase");
        foreach (var column in new[] { "Offered/s", "Achieved/s", "Sent", "Errors", "Error rate", "p50 ms", "p95 ms", "p99 ms", "max ms", "Statuses" })
        {
            table.AddColumn(new TableColumn(column).RightAligned());
        }

        foreach (var p in report.Phases)
        {
            table.AddRow(p.Name, F(p.TargetPerSecond, 0), F(p.AchievedPerSecond, 0), p.Sent.ToString(CultureInfo.InvariantCulture), p.Errors.ToString(CultureInfo.InvariantCulture),
                p.ErrorRate.ToString("P2", CultureInfo.InvariantCulture), F(p.LatencyP50Ms, 2), F(p.LatencyP95Ms, 2), F(p.LatencyP99Ms, 2), F(p.LatencyMaxMs, 1),
                Markup.Escape(string.Join(" ", p.Statuses.Select(s => $"{s.Key}×{s.Value}"))));
        }

        console.Write(table);
        console.MarkupLine(Markup.Escape(
            $"Store {report.Store}; {report.Connections} connections; schedule body {report.ScheduleBytes:N0} B, scan body {report.ScanBytes:N0} B; " +
            $"API process peak resident memory {F(report.ApiPeakResidentMiB ?? double.NaN, 0)} MiB (now {F(report.ApiResidentAfterMiB ?? double.NaN, 0)} MiB)."));
        if (json is not null)
        {
            await File.WriteAllTextAsync(json, OrchardJson.Serialize(report, indented: true) + "\n", cancellationToken);
        }

        return report.Phases.All(p => p.Errors == 0) ? 0 : 1;
    }

    private static string F(double value, int digits) => value.ToString("F" + digits.ToString(CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
}
