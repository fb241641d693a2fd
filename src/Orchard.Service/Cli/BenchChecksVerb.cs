using Orchard.Core.Serialization;
using Orchard.Service.Bench;

namespace Orchard.Service.Cli;

/// <summary><c>bench checks [--runs N] [--json FILE]</c>: configuration checks and IK solves per second.</summary>
internal static class BenchChecksVerb
{
    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var runs = args.Int("runs", 7, 1, 100);
        var checks = args.Int("checks", 200_000, 1_000, 100_000_000);
        var solves = args.Int("solves", 2_000, 10, 10_000_000);
        var json = args.Text("json");
        args.RejectUnknown();

        var result = ChecksBenchmark.Run(runs, checks, solves, cancellationToken);
        await stdout.WriteLineAsync($"bench checks on {result.TreeId} ({result.SceneCapsules} scene capsules), {result.Runs} runs, {(result.Machine.Release ? "Release" : "Debug")} build, {result.Machine.LogicalCores} cores:");
        await stdout.WriteLineAsync($"  configuration checks  {result.ChecksPerSecond,12:N0} /s median (one thread; {result.FreeShare:P0} of the sampled configurations are free)");
        await stdout.WriteLineAsync($"  edge checks           {result.EdgeChecksPerSecond,12:N0} /s (conservative advancement, neighbouring samples)");
        await stdout.WriteLineAsync($"  IK solves             {result.IkSolvesPerSecond,12:N0} /s median (one solution, aimed seed + 4 random)");
        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, BenchJson.Text(result), "--json", stdout, cancellationToken);
        }

        return 0;
    }
}
