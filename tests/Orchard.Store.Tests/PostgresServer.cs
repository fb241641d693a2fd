using System.Diagnostics;
using Npgsql;

namespace Orchard.Store.Tests;

/// <summary>
/// The PostgreSQL the tests run against: the one named by <c>ORCHARD_TEST_POSTGRES</c> (CI starts it with
/// deploy/local-postgres.sh), or else a throwaway one this fixture starts with that script and stops at
/// the end. When neither works the tests fail with the reason; they never skip.
/// </summary>
public sealed class PostgresServer : IAsyncLifetime
{
    public const string EnvironmentVariable = "ORCHARD_TEST_POSTGRES";

    private Process? script;

    /// <summary>A connection string to a database we may create other databases from.</summary>
    public string AdminConnectionString { get; private set; } = "";

    public async Task InitializeAsync()
    {
        var fromEnvironment = Environment.GetEnvironmentVariable(EnvironmentVariable);
        AdminConnectionString = string.IsNullOrWhiteSpace(fromEnvironment) ? await StartScriptAsync() : fromEnvironment;
        await using var connection = new NpgsqlConnection(AdminConnectionString);
        try
        {
            await connection.OpenAsync();
        }
        catch (Exception e) when (e is NpgsqlException or TimeoutException)
        {
            throw new InvalidOperationException($"PostgreSQL at '{AdminConnectionString}' is not reachable: {e.Message}", e);
        }
    }

    /// <summary>Creates a new empty database and returns its connection string.</summary>
    public async Task<string> CreateDatabaseAsync()
    {
        var name = "orchard_test_" + Guid.NewGuid().ToString("N");
        await using (var connection = new NpgsqlConnection(AdminConnectionString))
        {
            await connection.OpenAsync();
            await using var command = new NpgsqlCommand($"CREATE DATABASE {name}", connection);
            await command.ExecuteNonQueryAsync();
        }

        return new NpgsqlConnectionStringBuilder(AdminConnectionString) { Database = name }.ConnectionString;
    }

    public async Task DropDatabaseAsync(string connectionString)
    {
        var name = new NpgsqlConnectionStringBuilder(connectionString).Database;
        NpgsqlConnection.ClearAllPools();
        await using var connection = new NpgsqlConnection(AdminConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand($"DROP DATABASE IF EXISTS {name} WITH (FORCE)", connection);
        await command.ExecuteNonQueryAsync();
    }

    public async Task DisposeAsync()
    {
        if (script is null)
        {
            return;
        }

        // Closing its stdin tells the script to stop the server and delete its folder.
        script.StandardInput.Close();
        using var wait = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        try
        {
            await script.WaitForExitAsync(wait.Token);
        }
        catch (OperationCanceledException)
        {
            script.Kill(entireProcessTree: true);
        }

        script.Dispose();
    }

    private async Task<string> StartScriptAsync()
    {
        var path = Path.Combine(FindRepositoryRoot(), "deploy", "local-postgres.sh");
        var info = new ProcessStartInfo("bash", [path, "run"])
        {
            RedirectStandardInput = true,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        script = Process.Start(info) ?? throw new InvalidOperationException("Could not start " + path);
        var errors = script.StandardError.ReadToEndAsync();
        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(120));
        string? line;
        try
        {
            line = await script.StandardOutput.ReadLineAsync(timeout.Token);
        }
        catch (OperationCanceledException)
        {
            line = null;
        }

        if (string.IsNullOrWhiteSpace(line) || !line.StartsWith("Host=", StringComparison.Ordinal))
        {
            if (!script.HasExited)
            {
                script.Kill(entireProcessTree: true);
            }

            var stderr = script.HasExited ? await errors : "(no output in 120 s)";
            throw new InvalidOperationException(
                $"PostgreSQL could not be started for the store tests ({EnvironmentVariable} is not set, and deploy/local-postgres.sh failed): {stderr.Trim()}");
        }

        return line;
    }

    /// <summary>The folder holding Orchard.sln, above the test binaries.</summary>
    internal static string FindRepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "Orchard.sln")))
            {
                return dir.FullName;
            }
        }

        throw new InvalidOperationException("Orchard.sln not found above " + AppContext.BaseDirectory);
    }
}
