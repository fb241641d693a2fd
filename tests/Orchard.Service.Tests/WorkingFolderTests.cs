using System.Diagnostics;
using System.Text;

namespace Orchard.Service.Tests;

/// <summary>
/// Relative paths on the command line mean the folder the user runs the command from, for the built
/// executable and for <c>dotnet run --project src/Orchard.Service</c> from anywhere; every file message
/// names the full path it tried. Each test runs the real executable in a fresh temporary folder.
/// </summary>
public sealed class WorkingFolderTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("orchard-cwd-").FullName;

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public async Task Demo_export_and_plan_read_and_write_relative_to_the_folder_they_run_in()
    {
        var export = await RunAsync(["demo", "export", "out", "--trees-per-row", "1"]);
        Assert.True(export.Code == 0, export.Text);
        Assert.Contains($"to {Path.Combine(_folder, "out")} ", export.Stdout, StringComparison.Ordinal);
        Assert.True(File.Exists(Path.Combine(_folder, "out", "arm.json")));

        var plan = await RunAsync(["plan", Path.Combine("out", "K1-001.json"), "--arm", Path.Combine("out", "arm.json"), "--format", "json"]);
        Assert.True(plan.Code == 0, plan.Text);
        Assert.Contains("\"treeId\": \"K1-001\"", plan.Stdout, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Missing_and_unreadable_files_are_named_by_their_full_path()
    {
        var missing = await RunAsync(["plan", "myscan.json"]);
        Assert.Equal(1, missing.Code);
        Assert.Contains($"scan: no such file: {Path.Combine(_folder, "myscan.json")}", missing.Stderr, StringComparison.Ordinal);

        await File.WriteAllTextAsync(Path.Combine(_folder, "broken.json"), "{ \"treeId\": ");
        var broken = await RunAsync(["plan", "broken.json"]);
        Assert.Equal(1, broken.Code);
        Assert.Contains($"scan {Path.Combine(_folder, "broken.json")} at $", broken.Stderr, StringComparison.Ordinal);

        var noArm = await RunAsync(["plan", "broken.json", "--arm", Path.Combine("arms", "a.json")]);
        Assert.Equal(1, noArm.Code);
        Assert.Contains($"--arm: no such file: {Path.Combine(_folder, "arms", "a.json")}", noArm.Stderr, StringComparison.Ordinal);

        var noFolder = await RunAsync(["bench", "sequencing", "--tsplib", "tsplib"]);
        Assert.Equal(2, noFolder.Code);
        Assert.Contains($"no folder '{Path.Combine(_folder, "tsplib")}'", noFolder.Stderr, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Serve_keeps_its_embedded_store_in_the_folder_it_runs_in_and_says_where()
    {
        var info = StartInfo(["serve", "--urls", "http://127.0.0.1:0", "--Orchard:LogLevel", "Warning"]);
        using var process = Process.Start(info)!;
        var said = new TaskCompletionSource<string>(TaskCreationOptions.RunContinuationsAsynchronously);
        process.OutputDataReceived += (_, e) =>
        {
            if (e.Data?.StartsWith("Embedded store: ", StringComparison.Ordinal) == true)
            {
                said.TrySetResult(e.Data);
            }
        };
        process.ErrorDataReceived += (_, _) => { };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        try
        {
            var line = await said.Task.WaitAsync(TimeSpan.FromSeconds(60));
            var file = Path.Combine(_folder, "data", "orchard.db");
            Assert.Equal($"Embedded store: {file}", line);
            for (var i = 0; i < 300 && !File.Exists(file); i++)
            {
                await Task.Delay(100);
            }

            Assert.True(File.Exists(file), $"{file} was not made");
        }
        finally
        {
            process.Kill(entireProcessTree: true);
            await process.WaitForExitAsync();
        }
    }

    /// <summary>
    /// The README's form, <c>dotnet run --project src/Orchard.Service -- …</c>, from a folder outside the
    /// repository: the SDK would run the program in the project folder unless the project says otherwise.
    /// <c>--no-build</c> uses the build these tests run against.
    /// </summary>
    [Fact]
    public async Task Dotnet_run_with_the_project_option_works_in_the_folder_it_is_run_from()
    {
        var project = Path.Combine(RepositoryRoot(), "src", "Orchard.Service");
#if DEBUG
        const string configuration = "Debug";
#else
        const string configuration = "Release";
#endif
        var info = new ProcessStartInfo("dotnet") { WorkingDirectory = _folder, UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var word in new[] { "run", "--no-build", "-c", configuration, "--project", project, "--", "demo", "export", "here", "--trees-per-row", "1" })
        {
            info.ArgumentList.Add(word);
        }

        var result = await RunAsync(info);

        Assert.True(result.Code == 0, result.Text);
        Assert.True(File.Exists(Path.Combine(_folder, "here", "arm.json")), result.Text);
        Assert.False(Directory.Exists(Path.Combine(project, "here")), "dotnet run wrote into the project folder");
    }

    private static string RepositoryRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Orchard.sln")))
        {
            dir = dir.Parent;
        }

        return dir?.FullName ?? throw new InvalidOperationException($"No Orchard.sln above {AppContext.BaseDirectory}.");
    }

    private ProcessStartInfo StartInfo(IEnumerable<string> args)
    {
        var info = new ProcessStartInfo("dotnet") { WorkingDirectory = _folder, UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        info.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "orchard.dll"));
        foreach (var arg in args)
        {
            info.ArgumentList.Add(arg);
        }

        return info;
    }

    private Task<Outcome> RunAsync(IEnumerable<string> args) => RunAsync(StartInfo(args));

    private static async Task<Outcome> RunAsync(ProcessStartInfo info)
    {
        using var process = Process.Start(info)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromMinutes(3));
        await process.WaitForExitAsync(timeout.Token);
        return new Outcome(process.ExitCode, await stdout, await stderr);
    }

    private sealed record Outcome(int Code, string Stdout, string Stderr)
    {
        public string Text => new StringBuilder().Append("exit ").Append(Code).Append('\n').Append(Stdout).Append('\n').Append(Stderr).ToString();
    }
}
