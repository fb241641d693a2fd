using System.Globalization;
using Orchard.Core.Demo;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Service.Bench;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary><c>bench coverage [--seeds a,b,c] [--trees-per-row N] [--json FILE]</c>: share of eligible cuts scheduled over whole demo orchards.</summary>
internal static class BenchCoverageVerb
{
    /// <summary>The default demo seed and two others.</summary>
    public static readonly ulong[] DefaultSeeds = [DemoOrchardSettings.DefaultSeed, 11, 29];

    public static async Task<int> RunAsync(CliArguments args, TextWriter stdout, CancellationToken cancellationToken)
    {
        var seedsText = args.Text("seeds");
        var treesPerRow = args.Int("trees-per-row", 4, 1, DemoOrchardSettings.MaxTreesPerRow);
        var json = args.Text("json");
        var maxStops = args.Int("max-stops", SequencingSettings.Default.Stops.MaxStops, 1, 10);
        var clearanceMm = args.Int("clearance-target-mm", (int)Math.Round(SequencingSettings.Default.Reachability.ClearanceTargetM * 1000), 0, 200);
        var retreatMm = args.Int("max-retreat-mm", (int)Math.Round(SequencingSettings.Default.Reachability.MaxRetreatM * 1000), 0, 500);
        var noFallingWood = args.Flag("no-falling-wood");
        args.RejectUnknown();
        var defaults = SequencingSettings.Default;
        var settings = defaults with
        {
            Stops = defaults.Stops with { MaxStops = maxStops },
            Reachability = defaults.Reachability with { ClearanceTargetM = clearanceMm / 1000.0, MaxRetreatM = retreatMm / 1000.0 },
            AssumeFallingWood = !noFallingWood,
            ReplanMovesAgainstCurrentScene = !noFallingWood,
        };
        var seeds = seedsText is null ? DefaultSeeds : ParseSeeds(seedsText);

        var result = CoverageBenchmark.Run(seeds, treesPerRow, settings, line => stdout.WriteLine(line), cancellationToken);
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        console.Profile.Width = Math.Max(console.Profile.Width, 200);
        var table = new Table().Border(TableBorder.Rounded).AddColumn("Seed");
        foreach (var column in new[] { "Trees", "Nothing scheduled", "Eligible", "Scheduled", "Coverage", "Left (by reason)", "Stops", "Arm s / tree", "Plan s median", "Plan s max" })
        {
            table.AddColumn(new TableColumn(column).RightAligned());
        }

        foreach (var s in result.Seeds)
        {
            table.AddRow(s.Seed.ToString(CultureInfo.InvariantCulture), s.Trees.ToString(CultureInfo.InvariantCulture), s.TreesWithNothingScheduled.ToString(CultureInfo.InvariantCulture),
                s.Eligible.ToString(CultureInfo.InvariantCulture), s.Scheduled.ToString(CultureInfo.InvariantCulture), $"{s.CoverageShare:P1}",
                Markup.Escape(string.Join(", ", s.UnscheduledByReason.Select(p => $"{p.Key} {p.Value}"))), s.Stops.ToString(CultureInfo.InvariantCulture),
                $"{s.ArmSecondsPerTree:F1}", $"{s.MedianPlanSeconds:F2}", $"{s.MaxPlanSeconds:F2}");
        }

        console.Write(table);
        console.MarkupLine($"All seeds: {result.ScheduledTotal} of {result.EligibleTotal} eligible cuts scheduled ({result.CoverageShare:P1}).");
        if (json is not null)
        {
            await CliFiles.WriteTextAsync(json, BenchJson.Text(result), "--json", stdout, cancellationToken);
        }

        return 0;
    }

    private static ulong[] ParseSeeds(string text)
    {
        var seeds = new List<ulong>();
        foreach (var part in text.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            if (!ulong.TryParse(part, NumberStyles.Integer, CultureInfo.InvariantCulture, out var seed))
            {
                throw new UsageException($"--seeds takes whole numbers separated by commas; got '{part}'.");
            }

            seeds.Add(seed);
        }

        return seeds.Count > 0 ? seeds.ToArray() : throw new UsageException("--seeds needs at least one seed.");
    }
}
