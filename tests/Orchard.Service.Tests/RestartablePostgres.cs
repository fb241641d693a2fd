using System.Diagnostics;
using Npgsql;

namespace Orchard.Service.Tests;

/// <summary>
/// A PostgreSQL of the test's own (deploy/local-postgres.sh start --durable: fsync and synchronous commit
/// on, so a commit a client saw survives a crash) that the test may halt in immediate mode and resume.
/// Never the shared test server: halting that would break the tests running beside this one.
/// </summary>
public sealed class RestartablePostgres : IAsyncDisposable
{
    private RestartablePostgres(string connectionString, string folder)
    {
        ConnectionString = connectionString;
        Folder = folder;
    }

    /// <summary>The server's maintenance database; create a database of your own with <see cref="CreateDatabaseAsync"/>.</summary>
    public string ConnectionString { get; }

    public string Folder { get; }

    public static async Task<RestartablePostgres> StartAsync()
    {
        var output = await RunScriptAsync("start", "--durable");
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        if (lines.Length < 2 || !lines[0].StartsWith("Host=", StringComparison.Ordinal))
        {
            throw new InvalidOperationException("deploy/local-postgres.sh start --durable printed no connection string: " + output);
        }

        return new RestartablePostgres(lines[0], lines[1]);
    }

    public async Task<string> CreateDatabaseAsync(string name)
    {
        await using (var connection = new NpgsqlConnection(ConnectionString))
        {
            await connection.OpenAsync();
            await using var command = new NpgsqlCommand($"CREATE DATABASE {name}", connection);
            await command.ExecuteNonQueryAsync();
        }

        return new NpgsqlConnectionStringBuilder(ConnectionString) { Database = name }.ConnectionString;
    }

    /// <summary>Stops the server in immediate mode: every connection cut, no checkpoint (crash recovery on resume).</summary>
    public Task HaltAsync() => RunScriptAsync("halt", Folder);

    /// <summary>Starts it again on the same port and settings.</summary>
    public Task ResumeAsync() => RunScriptAsync("resume", Folder);

    public async ValueTask DisposeAsync() => await RunScriptAsync("stop", Folder);

    private static async Task<string> RunScriptAsync(params string[] arguments)
    {
        var info = new ProcessStartInfo("bash")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(Path.Combine(Orchard.Store.Tests.PostgresServer.FindRepositoryRoot(), "deploy", "local-postgres.sh"));
        foreach (var argument in arguments)
        {
            info.ArgumentList.Add(argument);
        }

        using var process = Process.Start(info) ?? throw new InvalidOperationException("could not run deploy/local-postgres.sh");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(180));
        await process.WaitForExitAsync(timeout.Token);
        if (process.ExitCode != 0)
        {
            throw new InvalidOperationException($"deploy/local-postgres.sh {string.Join(' ', arguments)} failed ({process.ExitCode}): {await stderr}");
        }

        return await stdout;
    }
}
