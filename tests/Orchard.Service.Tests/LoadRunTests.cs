using Orchard.Service.Bench;
using Orchard.Store.Tests;
using Xunit.Abstractions;

namespace Orchard.Service.Tests;

/// <summary>
/// The fixed-rate load run (<c>orchard bench load</c>) in its short CI profile, on both stores: an API
/// process of its own, GET schedule and POST scan offered at fixed rates; every request answered, none
/// with an error. Figures are printed, never asserted: timings belong to the benchmark, not to tests.
/// The long profile is <c>orchard bench load</c> with its defaults (README, Performance).
/// </summary>
[Collection(ReliabilityRuns.Name)]
public sealed class LoadRunTests(PostgresServer server, ITestOutputHelper output) : IClassFixture<PostgresServer>
{
    private static LoadSettings ShortProfile(string? postgres) => new(
        PostgresConnectionString: postgres,
        GetPerSecond: TestProfile.Pick(500, 3000),
        PostPerSecond: TestProfile.Pick(40, 100),
        Duration: TimeSpan.FromSeconds(TestProfile.Pick(4, 20)),
        Warmup: TimeSpan.FromSeconds(TestProfile.Pick(2, 5)),
        Connections: 32,
        SeedTrees: 2);

    [Fact]
    [Trait("Category", "Reliability")]
    public async Task Fixed_rate_load_on_the_embedded_store_gets_no_errors() => Check(await LoadBenchmark.RunAsync(ShortProfile(null), output.WriteLine, CancellationToken.None));

    [Fact]
    [Trait("Category", "Reliability")]
    public async Task Fixed_rate_load_on_postgresql_gets_no_errors() =>
        Check(await LoadBenchmark.RunAsync(ShortProfile(await server.CreateDatabaseAsync()), output.WriteLine, CancellationToken.None));

    private void Check(LoadReport report)
    {
        foreach (var phase in report.Phases)
        {
            output.WriteLine($"{report.Store} {phase.Name}: offered {phase.TargetPerSecond}/s, achieved {phase.AchievedPerSecond:F0}/s, sent {phase.Sent}, errors {phase.Errors}, " +
                $"p50 {phase.LatencyP50Ms:F2} ms, p95 {phase.LatencyP95Ms:F2} ms, p99 {phase.LatencyP99Ms:F2} ms, max {phase.LatencyMaxMs:F1} ms; {string.Join(" ", phase.Statuses.Select(s => $"{s.Key}×{s.Value}"))}");
        }

        output.WriteLine($"API process peak resident memory {report.ApiPeakResidentMiB:F0} MiB; schedule body {report.ScheduleBytes} B");
        Assert.Equal(["GET schedule", "POST scan"], report.Phases.Select(p => p.Name));
        Assert.All(report.Phases, p =>
        {
            Assert.Equal((long)Math.Round(p.TargetPerSecond * p.DurationSeconds), p.Sent);
            Assert.Equal(0, p.Errors);
            Assert.Equal(p.Sent, p.Succeeded);
            Assert.Single(p.Statuses);
            Assert.True(p.LatencyP50Ms <= p.LatencyP95Ms && p.LatencyP95Ms <= p.LatencyP99Ms && p.LatencyP99Ms <= p.LatencyMaxMs, "percentiles are ordered");
        });
        Assert.Equal("200", report.Phases[0].Statuses.Keys.Single());
        Assert.Equal("202", report.Phases[1].Statuses.Keys.Single());
        Assert.True(report.ScheduleBytes > 1000, "the GET phase fetched a real schedule");
        Assert.True(report.ApiPeakResidentMiB > 10, "the API process's peak memory was read from /proc");
    }
}
