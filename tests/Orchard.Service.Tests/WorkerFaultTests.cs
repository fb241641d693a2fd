using System.Diagnostics;
using System.Net.Http.Json;
using System.Text.Json;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;
using Orchard.Store.Tests;
using Xunit.Abstractions;

namespace Orchard.Service.Tests;

/// <summary>
/// Three `orchard worker` processes on one PostgreSQL and an API process; demo scans posted while a
/// random worker is killed with SIGKILL every two seconds and restarted: every plan completes, each job
/// has exactly one result, no accepted scan is lost. CI posts 30 scans trimmed to 4 cuts; the long
/// profile (ORCHARD_PROFILE=long) posts 200 whole demo trees.
/// </summary>
[Collection(ReliabilityRuns.Name)]
public sealed class WorkerFaultTests(PostgresServer server, ITestOutputHelper output) : IClassFixture<PostgresServer>
{
    [Fact]
    [Trait("Category", "Reliability")]
    public async Task Killed_workers_lose_nothing_and_do_nothing_twice()
    {
        var scans = TestProfile.Pick(30, 200);
        var cutsPerScan = TestProfile.Pick(4, int.MaxValue);
        var started = Stopwatch.StartNew();
        var connection = await server.CreateDatabaseAsync();
        await using var api = await ServiceUnderTest.StartAsync(connection, workers: 0);
        var workers = Enumerable.Range(0, 3).Select(_ => StartWorker(connection)).ToList();
        var random = new Orchard.Core.Randomness.DeterministicRandom(77);
        var kills = 0;
        try
        {
            var trees = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: (scans + 5) / 6)).Trees.Take(scans).ToList();
            Assert.Equal(scans, trees.Count);
            var jobs = new List<string>();
            foreach (var tree in trees)
            {
                var scan = tree.Scan with { Cuts = tree.Scan.Cuts.Take(cutsPerScan).ToArray() };
                using var post = await api.Http.SendAsync(api.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(OrchardJson.Serialize(scan)), "fault-" + tree.Scan.TreeId));
                post.EnsureSuccessStatusCode();
                jobs.Add((await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!);
            }

            var until = DateTime.UtcNow + TimeSpan.FromMinutes(TestProfile.Pick(4, 30));
            while (DateTime.UtcNow < until)
            {
                var statuses = new List<Orchard.Store.JobStatus>();
                foreach (var job in jobs)
                {
                    statuses.Add((await api.Store.GetJobAsync(job, CancellationToken.None))!.Status);
                }

                if (statuses.All(s => s is Orchard.Store.JobStatus.Done or Orchard.Store.JobStatus.Failed))
                {
                    break;
                }

                // Kills go on while work is waiting to be claimed; the last jobs in flight then finish in
                // peace. (Some whole demo trees take half a minute to plan, longer than three workers
                // each killed every six seconds on average would ever let them run.)
                if (kills > 0 && !statuses.Contains(Orchard.Store.JobStatus.Queued))
                {
                    await Task.Delay(1000);
                    continue;
                }

                // SIGKILL a random worker mid-work and start a fresh one.
                var victim = random.NextInt(workers.Count);
                workers[victim].Kill(entireProcessTree: true);
                await workers[victim].WaitForExitAsync();
                workers[victim].Dispose();
                workers[victim] = StartWorker(connection);
                kills++;
                await Task.Delay(2000);
            }

            var finished = new List<Orchard.Store.JobRecord>();
            foreach (var job in jobs)
            {
                finished.Add((await api.Store.GetJobAsync(job, CancellationToken.None))!);
            }

            Assert.All(finished, j => Assert.Equal(Orchard.Store.JobStatus.Done, j.Status));
            Assert.All(finished, j => Assert.Equal(1, j.ScheduleVersion));
            var rows = await api.Store.CountRowsAsync(CancellationToken.None);
            var attempts = finished.Sum(j => j.Attempt);
            output.WriteLine($"{scans} scans ({(cutsPerScan == int.MaxValue ? "whole trees" : $"{cutsPerScan} cuts each")}), {kills} SIGKILLs, {attempts} attempts in all " +
                $"({attempts - scans} re-claimed after a kill), drained in {started.Elapsed.TotalSeconds:F0} s; rows: {string.Join(", ", rows.Select(p => $"{p.Key}={p.Value}"))}");
            Assert.Equal(scans, rows["scans"]);
            Assert.Equal(scans, rows["jobs"]);
            Assert.Equal(scans, rows["schedules"]);
            Assert.True(kills >= 1, "at least one worker was killed while work was queued");
        }
        finally
        {
            foreach (var worker in workers)
            {
                if (!worker.HasExited)
                {
                    worker.Kill(entireProcessTree: true);
                }

                worker.Dispose();
            }
        }
    }

    [Fact]
    [Trait("Category", "Reliability")]
    public async Task A_worker_told_to_stop_finishes_or_gives_back_its_job()
    {
        var connection = await server.CreateDatabaseAsync();
        await using var api = await ServiceUnderTest.StartAsync(connection, workers: 0);
        using var post = await api.Http.SendAsync(api.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(OrchardJson.Serialize(DemoOrchard.Generate().Trees[3].Scan))));
        var jobId = (await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!;
        using var worker = StartWorker(connection);
        try
        {
            // Wait until it is planning, then SIGTERM it.
            var until = DateTime.UtcNow + TimeSpan.FromSeconds(60);
            while ((await api.Store.GetJobAsync(jobId, CancellationToken.None))!.Status == Orchard.Store.JobStatus.Queued && DateTime.UtcNow < until)
            {
                await Task.Delay(50);
            }

            using (var term = Process.Start("kill", ["-TERM", worker.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)]))
            {
                await term!.WaitForExitAsync();
            }

            using var grace = new CancellationTokenSource(TimeSpan.FromSeconds(40));
            await worker.WaitForExitAsync(grace.Token);
            var job = (await api.Store.GetJobAsync(jobId, CancellationToken.None))!;
            Assert.True(job.Status is Orchard.Store.JobStatus.Done or Orchard.Store.JobStatus.Queued, $"after SIGTERM the job is {job.Status} (lease owner {job.LeaseOwner})");
            if (job.Status == Orchard.Store.JobStatus.Queued)
            {
                Assert.Null(job.LeaseOwner);
            }
        }
        finally
        {
            if (!worker.HasExited)
            {
                worker.Kill(entireProcessTree: true);
            }
        }
    }

    private static Process StartWorker(string connection)
    {
        var info = new ProcessStartInfo("dotnet")
        {
            UseShellExecute = false,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var arg in new[]
        {
            Path.Combine(AppContext.BaseDirectory, "orchard.dll"), "worker", "--urls", "http://127.0.0.1:0",
            "--Orchard:PostgresConnectionString", connection, "--Orchard:LeaseSeconds", "4", "--Orchard:WorkerProcesses", "3",
            "--Orchard:LogLevel", "Warning",
            // Kills here come every few seconds, far more often than any real failure: the claim limit
            // (tested in the store contract) is lifted so the run checks only that killed work is never lost.
            "--Orchard:MaxClaimsPerJob", "1000",
        })
        {
            info.ArgumentList.Add(arg);
        }

        var process = Process.Start(info)!;
        process.OutputDataReceived += (_, _) => { };
        process.ErrorDataReceived += (_, _) => { };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        return process;
    }
}
