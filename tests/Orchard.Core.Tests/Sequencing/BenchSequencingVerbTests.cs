using System.Text.Json;
using Orchard.Service.Cli;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>The <c>bench sequencing</c> verb on a folder it is given: a unit square, whose answers are plain.</summary>
public sealed class BenchSequencingVerbTests
{
    [Fact]
    public async Task Solves_each_instance_closed_and_open_and_writes_the_json_report()
    {
        var dir = Path.Combine(Path.GetTempPath(), "orchard-bench-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        try
        {
            // Corners of a 10 × 10 square: closed optimum 40; open from node 1 is 30; the longest edge is the
            // diagonal, 14; the optimal tour 1-2-3-4 drops a side of 10 at node 1, so 26 ≤ open ≤ 30.
            await File.WriteAllTextAsync(Path.Combine(dir, "square4.tsp"), "NAME: square4\nTYPE: TSP\nDIMENSION: 4\nEDGE_WEIGHT_TYPE: EUC_2D\nNODE_COORD_SECTION\n1 0 0\n2 10 0\n3 10 10\n4 0 10\nEOF\n");
            await File.WriteAllTextAsync(Path.Combine(dir, "square4.opt.tour"), "NAME: square4.opt.tour\nTYPE: TOUR\nDIMENSION: 4\nTOUR_SECTION\n1\n2\n3\n4\n-1\nEOF\n");
            await File.WriteAllTextAsync(Path.Combine(dir, "optima.csv"), "instance,optimum\nsquare4,40\n");
            var json = Path.Combine(dir, "report.json");
            using var stdout = new StringWriter();
            using var stderr = new StringWriter();

            var code = await CommandLine.RunAsync(["bench", "sequencing", "--tsplib", dir, "--json", json, "--seconds", "5", "--solution-limit", "20"], stdout, stderr, CancellationToken.None);

            Assert.True(code == 0, stderr.ToString() + stdout);
            Assert.Contains("square4", stdout.ToString(), StringComparison.Ordinal);
            using var report = JsonDocument.Parse(await File.ReadAllTextAsync(json));
            var row = report.RootElement.GetProperty("instances")[0];
            Assert.Equal("square4", row.GetProperty("instance").GetString());
            Assert.Equal(40, row.GetProperty("optimum").GetInt64());
            Assert.Equal(40, row.GetProperty("closedLength").GetInt64());
            Assert.Equal(30, row.GetProperty("openLength").GetInt64());
            Assert.Equal(26, row.GetProperty("openLowerBound").GetInt64());
            Assert.Equal(30, row.GetProperty("openUpperBound").GetInt64());
            Assert.True(row.GetProperty("seconds").GetDouble() >= 0);
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public async Task Usage_mistakes_exit_with_code_2_and_say_what_is_wrong()
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();
        Assert.Equal(2, await CommandLine.RunAsync(["bench", "nothing"], stdout, stderr, CancellationToken.None));
        Assert.Contains("Unknown benchmark 'nothing'", stderr.ToString(), StringComparison.Ordinal);
        Assert.Equal(2, await CommandLine.RunAsync(["bench", "sequencing", "--tsplib", "/nonexistent-orchard-dir"], stdout, stderr, CancellationToken.None));
        Assert.Contains("no folder '/nonexistent-orchard-dir'", stderr.ToString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Without_tsplib_it_reads_the_copies_kept_in_the_repository()
    {
        using var stdout = new StringWriter();
        using var stderr = new StringWriter();

        // One solution per solve: this checks where the files come from, not the solver.
        var code = await CommandLine.RunAsync(["bench", "sequencing", "--seconds", "1", "--solution-limit", "1"], stdout, stderr, CancellationToken.None);

        Assert.True(code == 0, stderr.ToString() + stdout);
        Assert.Contains($"TSPLIB instances from {RepositoryTsplib.Directory}.", stdout.ToString(), StringComparison.Ordinal);
        foreach (var name in RepositoryTsplib.Optima().Keys)
        {
            Assert.Contains(name, stdout.ToString(), StringComparison.Ordinal);
        }
    }
}
