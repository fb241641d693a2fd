using System.Diagnostics;
using System.Globalization;
using System.Text.Json;
using Orchard.Core.Serialization;
using Orchard.Service.Bench;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>bench checks [--runs N] [--baseline ORCHARD_DLL [--rounds N]] [--json FILE]</c>: configuration checks, edge
/// checks and IK solves per second; with <c>--baseline</c>, another build's <c>bench checks</c> (a child process)
/// and this build's take turns, round after round, and the medians over the rounds are compared.
/// </summary>
internal static class BenchChecksVerb
{
    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var runs = args.Int("runs", 7, 1, 100);
        var checks = args.Int("checks", 200_000, 1_000, 100_000_000);
        var solves = args.Int("solves", 2_000, 10, 10_000_000);
        var baseline = args.Text("baseline");
        var rounds = args.Int("rounds", 3, 1, 50);
        var json = args.Text("json");
        args.RejectUnknown();
        if (baseline is not null && !File.Exists(baseline))
        {
            throw new UsageException($"--baseline needs the path of another build's orchard.dll; '{Path.GetFullPath(baseline)}' does not exist.");
        }

        if (baseline is null)
        {
            var result = ChecksBenchmark.Run(runs, checks, solves, cancellationToken);
            await stdout.WriteLineAsync($"bench checks on {result.TreeId} ({result.SceneCapsules} scene capsules), {result.Runs} runs, {(result.Machine.Release ? "Release" : "Debug")} build, {result.Machine.LogicalCores} cores:");
            await stdout.WriteLineAsync($"  configuration checks  {result.ChecksPerSecond,12:N0} /s median (one thread; {result.FreeShare:P0} of the sampled configurations are free)");
            await stdout.WriteLineAsync($"  edge checks           {result.EdgeChecksPerSecond,12:N0} /s median (conservative advancement, neighbouring samples)");
            await stdout.WriteLineAsync($"  IK solves             {result.IkSolvesPerSecond,12:N0} /s median (one solution, aimed seed + 4 random)");
            if (json is not null)
            {
                await CliFiles.WriteTextAsync(json, BenchJson.Text(result), "--json", stdout, cancellationToken);
            }

            return 0;
        }

        await stdout.WriteLineAsync($"baseline: {Path.GetFullPath(baseline)}; {rounds} rounds, each the baseline then this build, {runs} runs each");
        var mine = new List<ChecksBenchmark.Result>();
        var theirs = new List<(double Checks, double Edges, double Ik)>();
        for (var round = 0; round < rounds; round++)
        {
            theirs.Add(await RunBaselineAsync(baseline, runs, checks, solves, cancellationToken));
            mine.Add(ChecksBenchmark.Run(runs, checks, solves, cancellationToken));
            await stdout.WriteLineAsync(string.Create(CultureInfo.InvariantCulture,
                $"  round {round + 1}: configuration checks/s baseline {theirs[^1].Checks:N0}, this build {mine[^1].ChecksPerSecond:N0}"));
        }

        var comparison = new Comparison(
            Median(theirs.Select(t => t.Checks)), Median(mine.Select(m => m.ChecksPerSecond)),
            Median(theirs.Select(t => t.Edges)), Median(mine.Select(m => m.EdgeChecksPerSecond)),
            Median(theirs.Select(t => t.Ik)), Median(mine.Select(m => m.IkSolvesPerSecond)),
            rounds, mine[0].FreeShare, mine[0].TreeId, mine[0].Machine);
        await stdout.WriteLineAsync($"bench checks on {comparison.TreeId}, medians over {rounds} rounds (baseline → this build, ratio):");
        await stdout.WriteLineAsync($"  configuration checks/s  {comparison.BaselineChecksPerSecond,12:N0} → {comparison.ChecksPerSecond,12:N0}  {comparison.ChecksPerSecond / comparison.BaselineChecksPerSecond:F2}×");
        await stdout.WriteLineAsync($"  edge checks/s           {comparison.BaselineEdgeChecksPerSecond,12:N0} → {comparison.EdgeChecksPerSecond,12:N0}  {comparison.EdgeChecksPerSecond / comparison.BaselineEdgeChecksPerSecond:F2}×");
        await stdout.WriteLineAsync($"  IK solves/s             {comparison.BaselineIkSolvesPerSecond,12:N0} → {comparison.IkSolvesPerSecond,12:N0}  {comparison.IkSolvesPerSecond / comparison.BaselineIkSolvesPerSecond:F2}×");
        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, BenchJson.Text(comparison), "--json", stdout, cancellationToken);
        }

        return 0;
    }

    /// <summary>Side-by-side medians: the baseline build's and this build's.</summary>
    public sealed record Comparison(
        double BaselineChecksPerSecond,
        double ChecksPerSecond,
        double BaselineEdgeChecksPerSecond,
        double EdgeChecksPerSecond,
        double BaselineIkSolvesPerSecond,
        double IkSolvesPerSecond,
        int Rounds,
        double FreeShare,
        string TreeId,
        MachineInfo Machine);

    private static double Median(IEnumerable<double> values) => BenchStatistics.Median(values);

    /// <summary>Runs the other build's <c>bench checks --json</c> and reads its three rates.</summary>
    private static async Task<(double Checks, double Edges, double Ik)> RunBaselineAsync(string baseline, int runs, int checks, int solves, CancellationToken cancellationToken)
    {
        var file = Path.Combine(Path.GetTempPath(), $"orchard-bench-checks-{Environment.ProcessId}-{Guid.NewGuid():N}.json");
        try
        {
            var start = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
            foreach (var argument in new[] { Path.GetFullPath(baseline), "bench", "checks", "--runs", runs.ToString(CultureInfo.InvariantCulture), "--checks", checks.ToString(CultureInfo.InvariantCulture), "--solves", solves.ToString(CultureInfo.InvariantCulture), "--json", file })
            {
                start.ArgumentList.Add(argument);
            }

            // Older builds time each phase after one short warm-up run, which can end before the runtime has compiled the
            // optimised form of the hot methods (their edge checks measured 2.7x slow so); without the runtime's delay
            // before it counts calls, the baseline is timed at steady state as this build's longer warm-up is.
            start.Environment["DOTNET_TC_CallCountingDelayMs"] = "0";

            using var process = Process.Start(start) ?? throw new InvalidOperationException("Could not start the baseline build.");
            var output = process.StandardOutput.ReadToEndAsync(cancellationToken);
            var errors = process.StandardError.ReadToEndAsync(cancellationToken);
            await process.WaitForExitAsync(cancellationToken);
            if (process.ExitCode != 0 || !File.Exists(file))
            {
                throw new InvalidOperationException($"The baseline build's bench checks failed (exit {process.ExitCode}): {await errors}{await output}");
            }

            using var document = JsonDocument.Parse(await File.ReadAllTextAsync(file, cancellationToken));
            var root = document.RootElement;
            return (root.GetProperty("checksPerSecond").GetDouble(), root.GetProperty("edgeChecksPerSecond").GetDouble(), root.GetProperty("ikSolvesPerSecond").GetDouble());
        }
        finally
        {
            File.Delete(file);
        }
    }
}
