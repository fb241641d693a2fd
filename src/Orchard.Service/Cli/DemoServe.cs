using System.Globalization;
using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Service.Auth;
using Orchard.Service.Hosting;
using Orchard.Store;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>demo</c>: the main job on the embedded store. Starts the service, posts every tree of the invented
/// orchard through the real API as a tablet would, follows the planning queue with a progress bar, then
/// keeps serving and prints the address, one key per role with what it is for, and a curl walk-through
/// of the field loop. Keys the demo makes are marked as demo keys: the next run revokes them and makes
/// new ones, so they never pile up.
/// </summary>
internal static class DemoServe
{
    private static readonly (string Role, string Use)[] KeyUses =
    [
        (Roles.Tablet, "posts tree scans (POST /api/v1/scans)"),
        (Roles.Controller, "reads schedules, reports cut outcomes (GET …/schedule, POST …/outcomes)"),
        (Roles.Manager, "the review page (sign in with it) and the estimates"),
        (Roles.Admin, "arm profiles, API keys and the audit trail; opens the page as a manager"),
    ];

    public static async Task<int> RunAsync(DemoOrchardSettings settings, string urls, string dataFolder, TextWriter stdout, CancellationToken cancellationToken)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        var orchard = DemoOrchard.Generate(settings);
        // The demo posts every tree with one tablet key at once; its queue quota is lifted to the orchard's size.
        var quota = Math.Max(new OrchardOptions().MaxOpenJobsPerKey, orchard.Trees.Count + 10).ToString(CultureInfo.InvariantCulture);
        var app = OrchardHost.Build(
            ["--urls", urls, "--Orchard:DataFolder", dataFolder, "--Orchard:Workers", "1", "--Orchard:LogLevel", "Warning", "--Orchard:MaxOpenJobsPerKey", quota],
            withApi: true,
            withWorkers: true);

        // The keys are made before the service starts, so it finds an admin key and makes no bootstrap key.
        var store = app.Services.GetRequiredService<IOrchardStore>();
        await store.MigrateAsync(cancellationToken);
        var replaced = await store.RevokeDemoKeysAsync(null, cancellationToken);
        var keys = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (role, _) in KeyUses)
        {
            keys[role] = await NewDemoKeyAsync(store, role, cancellationToken);
        }

        await app.StartAsync(cancellationToken);
        var address = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First().TrimEnd('/') + "/";
        await RegisterRowsAsync(address, keys[Roles.Admin], orchard, cancellationToken);
        console.MarkupLine($"[bold]{Markup.Escape(orchard.FarmName)}[/] (invented demo orchard): planning {orchard.Trees.Count} trees on the {store.Kind} store in [grey]{Markup.Escape(Path.GetFullPath(dataFolder))}[/].");
        using var http = new HttpClient { BaseAddress = new Uri(address), Timeout = TimeSpan.FromMinutes(2) };
        http.DefaultRequestHeaders.Add(ApiKeySecrets.HeaderName, keys[Roles.Tablet]);
        var jobs = new List<string>();
        foreach (var tree in orchard.Trees)
        {
            using var request = new HttpRequestMessage(HttpMethod.Post, "/api/v1/scans") { Content = new StringContent(OrchardJson.Serialize(tree.Scan), System.Text.Encoding.UTF8, "application/json") };
            request.Headers.Add("Idempotency-Key", $"demo-{settings.Seed}-{tree.Scan.TreeId}");
            using var response = await http.SendAsync(request, cancellationToken);
            response.EnsureSuccessStatusCode();
            jobs.Add((await response.Content.ReadFromJsonAsync<JsonElement>(cancellationToken)).GetProperty("jobId").GetString()!);
        }

        await console.Progress().Columns(new TaskDescriptionColumn(), new ProgressBarColumn(), new PercentageColumn(), new ElapsedTimeColumn())
            .StartAsync(async context =>
            {
                var bar = context.AddTask("Planning cut schedules", maxValue: jobs.Count);
                while (!cancellationToken.IsCancellationRequested)
                {
                    var finished = 0;
                    foreach (var job in jobs)
                    {
                        var record = await store.GetJobAsync(job, cancellationToken);
                        finished += record?.Status is JobStatus.Done or JobStatus.Failed or JobStatus.Superseded ? 1 : 0;
                    }

                    bar.Value = finished;
                    if (finished == jobs.Count)
                    {
                        break;
                    }

                    await Task.Delay(500, cancellationToken);
                }
            });

        var trees = await store.ListTreesAsync(cancellationToken);
        var hours = trees.Sum(t => t.TotalSeconds ?? 0) / 3600;
        var planned = trees.Where(t => t.IsPlannedForLatestScan).ToList();
        var empty = planned.Where(t => (t.StepCount ?? 0) == 0).ToList();
        var failed = 0;
        foreach (var job in jobs)
        {
            failed += (await store.GetJobAsync(job, cancellationToken))?.Status == JobStatus.Failed ? 1 : 0;
        }

        // Trees with nothing scheduled are counted apart, with their reason: never hidden in a total.
        console.MarkupLine($"Scheduled cuts on {planned.Count - empty.Count} of {trees.Count} trees ({planned.Sum(t => t.StepCount ?? 0)} cuts, {hours:F2} arm-hours of cutting in all); "
            + $"nothing scheduled on {empty.Count}; planning failed on {failed}; {trees.Count - planned.Count - failed} not planned yet.");
        foreach (var tree in empty)
        {
            var record = await store.GetCurrentScheduleAsync(tree.TreeId, cancellationToken);
            var schedule = record is null ? null : OrchardJson.Parse<Schedule>(record.ScheduleJson).Value;
            var left = schedule is null ? null : string.Join(", ", schedule.Unscheduled.GroupBy(u => u.Reason?.ToString() ?? u.Status.ToString()).Select(g => $"{g.Count()} {g.Key}"));
            var why = (schedule is { Problems.Count: > 0 } ? schedule.Problems[0].Message : null)
                ?? (string.IsNullOrEmpty(left) ? schedule is null ? "no schedule found" : "the scan marks no cut" : "cuts left: " + left);
            console.MarkupLine($"  [bold]{Markup.Escape(tree.TreeId)}[/]: nothing scheduled — {Markup.Escape(why)}");
        }
        console.MarkupLine($"Review page: [bold]{Markup.Escape(address)}review/[/] — sign in with the manager key below.");
        console.MarkupLine($"API: {Markup.Escape(address)}api/v1/…, document {Markup.Escape(address)}openapi/v1.json; send a key as the X-Api-Key header.");
        console.MarkupLine($"Keys for this demo run ({(replaced > 0 ? $"the {replaced} of the previous run are revoked; " : string.Empty)}the next run revokes these):");
        // Plain lines (not a table, which would wrap the keys where a terminal is narrow): copy and paste them.
        foreach (var (role, use) in KeyUses)
        {
            await stdout.WriteLineAsync($"  {role,-10} {keys[role]}  {use}");
        }

        var first = trees.FirstOrDefault(t => t.IsPlannedForLatestScan && t.StepCount >= 2);
        if (first is not null)
        {
            console.MarkupLine("The field loop with curl (scan → schedule → outcome → re-plan), for a shell:");
            // Written as plain text (not through the console's layout, which would wrap long commands).
            await stdout.WriteAsync(DemoWalkthrough.Script(address, keys[Roles.Tablet], keys[Roles.Controller], keys[Roles.Manager], first.TreeId));
        }

        console.MarkupLine("[yellow]Safety:[/] schedules are plans for a supervised machine. Keep people out of the arm's exclusion zone, keep the emergency stop in reach, run at reduced speed near people, and follow local codes and the machine's own safety system.");
        console.MarkupLine("Press Ctrl+C to stop.");
        await app.WaitForShutdownAsync(cancellationToken);
        return 0;
    }

    /// <summary>The orchard's rows go into the row registry through the API, as an admin would put them.</summary>
    private static async Task RegisterRowsAsync(string address, string adminSecret, DemoOrchard orchard, CancellationToken cancellationToken)
    {
        using var admin = new HttpClient { BaseAddress = new Uri(address) };
        admin.DefaultRequestHeaders.Add(ApiKeySecrets.HeaderName, adminSecret);
        using var body = new StringContent(OrchardJson.Serialize(orchard.Registry()), System.Text.Encoding.UTF8, "application/json");
        using var response = await admin.PutAsync(new Uri("/api/v1/rows", UriKind.Relative), body, cancellationToken);
        response.EnsureSuccessStatusCode();
    }

    private static async Task<string> NewDemoKeyAsync(IOrchardStore store, string role, CancellationToken cancellationToken)
    {
        var secret = ApiKeySecrets.NewSecret();
        var hash = ApiKeySecrets.HashHex(secret);
        await store.AddApiKeyAsync(new ApiKeyRecord($"key-demo-{role}-{hash[..8]}", role, hash, $"demo {role}", DateTimeOffset.UtcNow) { Demo = true }, null, cancellationToken);
        return secret;
    }
}
