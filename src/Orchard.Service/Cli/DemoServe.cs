using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;
using Orchard.Service.Auth;
using Orchard.Service.Hosting;
using Orchard.Store;
using Spectre.Console;

namespace Orchard.Service.Cli;

/// <summary>
/// <c>demo</c>: the main job on the embedded store. Starts the service, posts every tree of the invented
/// orchard through the real API as a tablet would, follows the planning queue with a progress bar, then
/// keeps serving and prints the address and a manager key.
/// </summary>
internal static class DemoServe
{
    public static async Task<int> RunAsync(DemoOrchardSettings settings, string urls, string dataFolder, TextWriter stdout, CancellationToken cancellationToken)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(stdout) });
        var adminSecret = ApiKeySecrets.NewSecret();
        var app = OrchardHost.Build(
            ["--urls", urls, "--Orchard:DataFolder", dataFolder, "--Orchard:BootstrapAdminKey", adminSecret, "--Orchard:Workers", "1", "--Orchard:LogLevel", "Warning"],
            withApi: true,
            withWorkers: true);
        await app.StartAsync(cancellationToken);
        var address = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First().TrimEnd('/') + "/";
        var store = app.Services.GetRequiredService<IOrchardStore>();
        var tablet = await NewKeyAsync(store, Roles.Tablet, "demo tablet", cancellationToken);
        var manager = await NewKeyAsync(store, Roles.Manager, "demo manager", cancellationToken);

        var orchard = DemoOrchard.Generate(settings);
        await RegisterRowsAsync(address, adminSecret, orchard, cancellationToken);
        console.MarkupLine($"[bold]{Markup.Escape(orchard.FarmName)}[/] (invented demo orchard): planning {orchard.Trees.Count} trees on the {store.Kind} store in [grey]{Markup.Escape(Path.GetFullPath(dataFolder))}[/].");
        using var http = new HttpClient { BaseAddress = new Uri(address), Timeout = TimeSpan.FromMinutes(2) };
        http.DefaultRequestHeaders.Add(ApiKeySecrets.HeaderName, tablet);
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
                        finished += record?.Status is "done" or "failed" ? 1 : 0;
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
        console.MarkupLine($"Planned {trees.Count(t => t.CurrentVersion is not null)} of {trees.Count} trees: {hours:F2} arm-hours of cutting in all.");
        console.MarkupLine($"Review page: [bold]{Markup.Escape(address)}review/[/] — sign in with the manager key below.");
        console.MarkupLine($"Manager key (also for the API, as X-Api-Key): [bold]{Markup.Escape(manager)}[/]");
        console.MarkupLine($"API: {Markup.Escape(address)}api/v1/trees, document {Markup.Escape(address)}openapi/v1.json");
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

    private static async Task<string> NewKeyAsync(IOrchardStore store, string role, string label, CancellationToken cancellationToken)
    {
        var secret = ApiKeySecrets.NewSecret();
        var hash = ApiKeySecrets.HashHex(secret);
        await store.AddApiKeyAsync(new ApiKeyRecord($"key-{role}-{hash[..12]}", role, hash, label, DateTimeOffset.UtcNow), cancellationToken);
        return secret;
    }
}
