using System.Diagnostics;
using System.Net.Http.Json;
using System.Text.Json;
using Orchard.Service.Cli;

namespace Orchard.Service.Tests;

/// <summary>
/// The curl walk-through that `demo` prints (and the README shows) works as printed: run in bash against
/// a running service, it re-scans a planned tree, follows the plan, reports one cut done and one missed, and
/// ends with the re-planned schedule, version 3 (1 the first plan, 2 the re-scan's, 3 the re-plan's).
/// </summary>
public sealed class DemoWalkthroughTests
{
    [Fact]
    public async Task The_printed_walkthrough_runs_scan_schedule_outcome_and_replan()
    {
        await EnsureCurlAsync();
        await using var service = await ServiceUnderTest.StartAsync();
        var tree = DemoScans.Tree(4, cuts: 4).TreeId;
        using (var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(4, cuts: 4)))))
        {
            var job = (await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!;
            Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        }

        var script = DemoWalkthrough.Script(service.Http.BaseAddress!.ToString(), service.Keys["tablet"], service.Keys["controller"], service.Keys["manager"], tree);
        var folder = Directory.CreateTempSubdirectory("orchard-walk-").FullName;
        try
        {
            var info = new ProcessStartInfo("bash", ["-e", "-c", script]) { WorkingDirectory = folder, RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
            using var bash = Process.Start(info)!;
            var stdout = bash.StandardOutput.ReadToEndAsync();
            var stderr = bash.StandardError.ReadToEndAsync();
            using var timeout = new CancellationTokenSource(TimeSpan.FromMinutes(3));
            await bash.WaitForExitAsync(timeout.Token);
            var output = await stdout;
            Assert.True(bash.ExitCode == 0, $"exit {bash.ExitCode}\n{output}\n{await stderr}");
            Assert.Contains("schedule version 2", output, StringComparison.Ordinal);
            Assert.Contains("\"v3\"", output, StringComparison.Ordinal);
            var replanned = JsonDocument.Parse(await File.ReadAllTextAsync(Path.Combine(folder, "replanned.json"))).RootElement;
            Assert.Equal((3, 2), (replanned.GetProperty("version").GetInt32(), replanned.GetProperty("replansVersion").GetInt32()));
            Assert.Contains(replanned.GetProperty("unscheduled").EnumerateArray(), u => u.GetProperty("status").GetString() == "done");
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    [Fact]
    public void The_readme_shows_the_same_walkthrough()
    {
        var readme = File.ReadAllText(Path.Combine(Orchard.Store.Tests.PostgresServer.FindRepositoryRoot(), "README.md"));
        Assert.Contains(DemoWalkthrough.WithPlaceholders("K1-001"), readme.ReplaceLineEndings("\n"), StringComparison.Ordinal);
    }

    /// <summary>The walk-through needs curl; on a fresh machine the test command installs Debian's (as root).</summary>
    private static async Task EnsureCurlAsync()
    {
        using var install = Process.Start("bash", [Path.Combine(Orchard.Store.Tests.PostgresServer.FindRepositoryRoot(), "deploy", "ensure-packages.sh"), "curl"]);
        await install!.WaitForExitAsync();
        Assert.True(install.ExitCode == 0, "curl is missing; install it (deploy/ensure-packages.sh curl)");
    }
}
