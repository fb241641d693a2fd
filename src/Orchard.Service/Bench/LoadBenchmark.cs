using System.Globalization;
using System.Net;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;

namespace Orchard.Service.Bench;

/// <summary>
/// The fixed-rate load run on loopback. A first <c>orchard serve</c> (with a planning worker) plans a few
/// demo trees; then an API-only <c>orchard serve</c> on the same store — as an API replica runs — takes a
/// warm-up, GET schedule at a fixed rate, then POST scan at a fixed rate, while this process generates
/// the load and reads the API process's peak memory.
/// </summary>
internal static class LoadBenchmark
{
    public static async Task<LoadReport> RunAsync(LoadSettings settings, Action<string> progress, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(progress);
        var folder = Path.Combine(Path.GetTempPath(), "orchard-load-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        var adminKey = "ok_load_" + Guid.NewGuid().ToString("N");
        // On PostgreSQL each run gets a database of its own (dropped afterwards), so runs side by side
        // start equal and a queue left by one never delays the next.
        var database = "orchard_load_" + Guid.NewGuid().ToString("N")[..12];
        string? postgres = null;
        if (settings.PostgresConnectionString is { } server)
        {
            await ExecuteAsync(server, $"CREATE DATABASE {database}", cancellationToken);
            postgres = new Npgsql.NpgsqlConnectionStringBuilder(server) { Database = database }.ConnectionString;
        }

        var storeOptions = postgres is not null
            ? new[] { "--Orchard:PostgresConnectionString", postgres }
            : ["--Orchard:DataFolder", folder];
        // The rate limit and the queue quota are per key and meant for the field; the load run lifts them to
        // measure the service itself (an older build given as the baseline ignores options it does not know).
        var common = storeOptions.Concat(["--Orchard:BootstrapAdminKey", adminKey, "--Orchard:RequestsPerMinute", "100000000", "--Orchard:MaxOpenJobsPerKey", "100000000"]).ToArray();
        try
        {
            var trees = DemoOrchard.Generate().Trees;
            var seeded = trees.Take(settings.SeedTrees).Select(t => t.Scan.TreeId).ToArray();
            string tabletKey, controllerKey;
            await using (var planner = await ApiProcess.StartAsync(common.Concat(["--Orchard:Workers", "1"]), settings.ServerAssembly, cancellationToken))
            {
                using var http = new HttpClient { BaseAddress = planner.Address, Timeout = TimeSpan.FromSeconds(60) };
                tabletKey = await CreateKeyAsync(http, adminKey, "tablet", cancellationToken);
                controllerKey = await CreateKeyAsync(http, adminKey, "controller", cancellationToken);
                progress($"planning {seeded.Length} demo trees for the GET phase");
                var jobs = new List<string>();
                foreach (var tree in trees.Take(settings.SeedTrees))
                {
                    using var post = Request(HttpMethod.Post, "/api/v1/scans", tabletKey, OrchardJson.Serialize(tree.Scan), "seed-" + tree.Scan.TreeId);
                    using var response = await http.SendAsync(post, cancellationToken);
                    response.EnsureSuccessStatusCode();
                    jobs.Add((await response.Content.ReadFromJsonAsync<JsonElement>(cancellationToken)).GetProperty("jobId").GetString()!);
                }

                foreach (var job in jobs)
                {
                    await WaitForJobAsync(http, tabletKey, job, cancellationToken);
                }
            }

            progress("starting the API process alone (no planning worker)");
            await using var api = await ApiProcess.StartAsync(common.Concat(["--Orchard:Workers", "0"]), settings.ServerAssembly, cancellationToken);
            using var handler = new SocketsHttpHandler
            {
                MaxConnectionsPerServer = settings.Connections,
                PooledConnectionLifetime = Timeout.InfiniteTimeSpan,
                UseCookies = false,
                AutomaticDecompression = DecompressionMethods.None,
            };
            using var client = new HttpClient(handler) { BaseAddress = api.Address, Timeout = TimeSpan.FromSeconds(30) };

            long scheduleBytes;
            using (var first = Request(HttpMethod.Get, $"/api/v1/trees/{seeded[0]}/schedule", controllerKey))
            using (var firstResponse = await client.SendAsync(first, cancellationToken))
            {
                firstResponse.EnsureSuccessStatusCode();
                scheduleBytes = (await firstResponse.Content.ReadAsByteArrayAsync(cancellationToken)).LongLength;
            }

            // The posted scans are the demo trees under ids of their own: a scan of a seeded tree would make it
            // a re-scanned tree, whose schedule is not served until its new plan lands (no worker plans here).
            var scans = trees.Select(t => OrchardJson.Serialize(t.Scan with { TreeId = "L-" + t.Scan.TreeId })).ToArray();
            var runId = Guid.NewGuid().ToString("N")[..8];
            LoadPhase Gets(string name, TimeSpan duration) => new(name, settings.GetPerSecond, duration,
                i => Request(HttpMethod.Get, $"/api/v1/trees/{seeded[i % seeded.Length]}/schedule", controllerKey));
            LoadPhase Posts(string name, TimeSpan duration) => new(name, settings.PostPerSecond, duration,
                i => Request(HttpMethod.Post, "/api/v1/scans", tabletKey, scans[i % scans.Length], $"load-{runId}-{name}-{i.ToString(CultureInfo.InvariantCulture)}"));

            progress($"warm-up: {settings.WarmupDuration.TotalSeconds:F0} s of each request kind (not reported)");
            await FixedRateLoad.RunAsync(client, Gets("warmup-get", settings.WarmupDuration), s => s == 200, cancellationToken);
            await FixedRateLoad.RunAsync(client, Posts("warmup-post", settings.WarmupDuration / 2), s => s == 202, cancellationToken);

            var phases = new List<LoadPhaseResult>();
            progress($"GET schedule at {settings.GetPerSecond:F0}/s for {settings.PhaseDuration.TotalSeconds:F0} s");
            phases.Add(await FixedRateLoad.RunAsync(client, Gets("GET schedule", settings.PhaseDuration), s => s == 200, cancellationToken));
            progress($"POST scan at {settings.PostPerSecond:F0}/s for {settings.PhaseDuration.TotalSeconds:F0} s");
            phases.Add(await FixedRateLoad.RunAsync(client, Posts("POST scan", settings.PhaseDuration), s => s == 202, cancellationToken));

            const double MiB = 1024.0 * 1024.0;
            return new LoadReport(
                settings.ServerAssembly ?? "this build",
                MachineInfo.Current(),
                settings.PostgresConnectionString is null ? "sqlite" : "postgresql",
                settings.Connections,
                seeded.Length,
                scheduleBytes,
                (long)scans.Average(s => Encoding.UTF8.GetByteCount(s)),
                phases,
                api.PeakResidentBytes() / MiB,
                api.ResidentBytes() / MiB);
        }
        finally
        {
            if (settings.PostgresConnectionString is { } maintenance)
            {
                Npgsql.NpgsqlConnection.ClearAllPools();
                await ExecuteAsync(maintenance, $"DROP DATABASE IF EXISTS {database} WITH (FORCE)", CancellationToken.None);
            }

            try
            {
                Directory.Delete(folder, recursive: true);
            }
            catch (IOException)
            {
                // Left for the system's temp cleaner.
            }
        }
    }

    private static async Task ExecuteAsync(string connectionString, string sql, CancellationToken cancellationToken)
    {
        await using var connection = new Npgsql.NpgsqlConnection(connectionString);
        await connection.OpenAsync(cancellationToken);
        await using var command = new Npgsql.NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync(cancellationToken);
    }

    private static HttpRequestMessage Request(HttpMethod method, string path, string key, string? json = null, string? idempotencyKey = null)
    {
        var request = new HttpRequestMessage(method, new Uri(path, UriKind.Relative));
        request.Headers.Add("X-Api-Key", key);
        if (idempotencyKey is not null)
        {
            request.Headers.Add("Idempotency-Key", idempotencyKey);
        }

        if (json is not null)
        {
            request.Content = new StringContent(json, Encoding.UTF8, "application/json");
        }

        return request;
    }

    private static async Task<string> CreateKeyAsync(HttpClient http, string adminKey, string role, CancellationToken cancellationToken)
    {
        using var request = Request(HttpMethod.Post, "/api/v1/api-keys", adminKey, JsonSerializer.Serialize(new { role, label = role + " for the load run" }));
        using var response = await http.SendAsync(request, cancellationToken);
        response.EnsureSuccessStatusCode();
        return (await response.Content.ReadFromJsonAsync<JsonElement>(cancellationToken)).GetProperty("secret").GetString()!;
    }

    private static async Task WaitForJobAsync(HttpClient http, string key, string jobId, CancellationToken cancellationToken)
    {
        var until = DateTime.UtcNow + TimeSpan.FromMinutes(5);
        while (true)
        {
            using var request = Request(HttpMethod.Get, $"/api/v1/jobs/{jobId}", key);
            using var response = await http.SendAsync(request, cancellationToken);
            var status = (await response.Content.ReadFromJsonAsync<JsonElement>(cancellationToken)).GetProperty("status").GetString();
            if (status == "done")
            {
                return;
            }

            if (status == "failed" || DateTime.UtcNow > until)
            {
                throw new InvalidOperationException($"seed job {jobId} ended {status}");
            }

            await Task.Delay(200, cancellationToken);
        }
    }
}
