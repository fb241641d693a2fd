using System.Net.Http.Headers;
using System.Net.Http.Json;
using System.Text.Json;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.Extensions.DependencyInjection;
using Orchard.Service.Hosting;
using Orchard.Store;

namespace Orchard.Service.Tests;

/// <summary>
/// The real service on a loopback port (Kestrel, real HTTP), on the embedded store in a temp folder or
/// on the PostgreSQL given by <c>ORCHARD_TEST_POSTGRES</c>; an admin key, and tablet, controller and
/// manager keys made through the API.
/// </summary>
public sealed class ServiceUnderTest : IAsyncDisposable
{
    public const string AdminSecret = "ok_test_admin_secret_0123456789abcdef";

    private readonly WebApplication _app;
    private readonly string _folder;

    private ServiceUnderTest(WebApplication app, string folder, HttpClient http)
    {
        _app = app;
        _folder = folder;
        Http = http;
    }

    public HttpClient Http { get; }

    public IOrchardStore Store => _app.Services.GetRequiredService<IOrchardStore>();

    public Dictionary<string, string> Keys { get; } = new(StringComparer.Ordinal);

    public static async Task<ServiceUnderTest> StartAsync(string? postgres = null, long maxBodyBytes = 8 * 1024 * 1024, int requestsPerMinute = 1200, int workers = 1, IReadOnlyList<string>? extraArguments = null)
    {
        var folder = Path.Combine(Path.GetTempPath(), "orchard-service-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        var args = new List<string>
        {
            "--urls", "http://127.0.0.1:0",
            "--environment", "Production",
            "--Orchard:DataFolder", folder,
            "--Orchard:BootstrapAdminKey", AdminSecret,
            "--Orchard:MaxBodyBytes", maxBodyBytes.ToString(System.Globalization.CultureInfo.InvariantCulture),
            "--Orchard:LeaseSeconds", "10",
            "--Orchard:Workers", workers.ToString(System.Globalization.CultureInfo.InvariantCulture),
            "--Orchard:RequestsPerMinute", requestsPerMinute.ToString(System.Globalization.CultureInfo.InvariantCulture),
        };
        if (postgres is not null)
        {
            args.AddRange(["--Orchard:PostgresConnectionString", postgres]);
        }

        args.AddRange(extraArguments ?? []);

        var app = OrchardHost.Build(args.ToArray(), withApi: true, withWorkers: true);
        await app.StartAsync();
        var address = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First();
        var http = new HttpClient { BaseAddress = new Uri(address), Timeout = TimeSpan.FromSeconds(120) };
        var service = new ServiceUnderTest(app, folder, http);
        service.Keys["admin"] = AdminSecret;
        foreach (var role in new[] { "tablet", "controller", "manager" })
        {
            using var request = service.Request(HttpMethod.Post, "/api/v1/api-keys", "admin", JsonContent.Create(new { role, label = role + " under test" }));
            using var response = await http.SendAsync(request);
            response.EnsureSuccessStatusCode();
            var created = await response.Content.ReadFromJsonAsync<JsonElement>();
            service.Keys[role] = created.GetProperty("secret").GetString()!;
        }

        return service;
    }

    public HttpRequestMessage Request(HttpMethod method, string path, string? role, HttpContent? content = null, string? idempotencyKey = null)
    {
        var request = new HttpRequestMessage(method, path) { Content = content };
        if (role is not null)
        {
            request.Headers.Add("X-Api-Key", Keys.TryGetValue(role, out var secret) ? secret : role);
        }

        if (idempotencyKey is not null)
        {
            request.Headers.Add("Idempotency-Key", idempotencyKey);
        }

        return request;
    }

    public static StringContent Json(string json) => new(json, new MediaTypeHeaderValue("application/json"));

    /// <summary>Polls a job until it is done or failed.</summary>
    public async Task<JsonElement> WaitForJobAsync(string jobId, TimeSpan timeout)
    {
        var until = DateTime.UtcNow + timeout;
        while (true)
        {
            using var request = Request(HttpMethod.Get, $"/api/v1/jobs/{jobId}", "tablet");
            using var response = await Http.SendAsync(request);
            var job = await response.Content.ReadFromJsonAsync<JsonElement>();
            var status = job.GetProperty("status").GetString();
            if (status is "done" or "failed" || DateTime.UtcNow > until)
            {
                return job;
            }

            await Task.Delay(200);
        }
    }

    public async ValueTask DisposeAsync()
    {
        Http.Dispose();
        await _app.StopAsync();
        await _app.DisposeAsync();
        try
        {
            Directory.Delete(_folder, recursive: true);
        }
        catch (IOException)
        {
            // A file still closing; the temp folder is cleaned by the system.
        }
    }
}
