using System.Diagnostics;
using System.Net;
using System.Net.Sockets;

namespace Orchard.Service.Tests;

/// <summary>
/// Security hygiene: the page's and the API's security headers; /metrics behind an admin key, or alone and
/// anonymous on a port of its own; and, for a service started as in a container (output redirected), the
/// first admin key written to a file only its user can read, never to the log stream, with the embedded
/// database files and the data folder its user's only.
/// </summary>
public sealed class HygieneTests
{
    [Fact]
    public async Task The_page_and_the_api_carry_the_security_headers()
    {
        await using var service = await ServiceUnderTest.StartAsync();
        using var page = await service.Http.GetAsync(new Uri("/review/", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, page.StatusCode);
        var csp = page.Headers.GetValues("Content-Security-Policy").Single();
        Assert.Contains("script-src 'self'", csp, StringComparison.Ordinal);
        Assert.Contains("frame-ancestors 'none'", csp, StringComparison.Ordinal);
        Assert.DoesNotContain("unsafe-inline", csp, StringComparison.Ordinal);
        Assert.Equal("nosniff", page.Headers.GetValues("X-Content-Type-Options").Single());
        Assert.Equal("same-origin", page.Headers.GetValues("Referrer-Policy").Single());
        Assert.Equal("DENY", page.Headers.GetValues("X-Frame-Options").Single());

        // The page's own files hold no inline script or style for the policy to refuse.
        var html = await page.Content.ReadAsStringAsync();
        Assert.DoesNotMatch("<script(?![^>]*\\ssrc=)[^>]*>", html);
        Assert.DoesNotContain("style=", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("<style", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotMatch("<[^>]+\\son[a-z]+\\s*=", html);

        foreach (var (path, role) in new[] { ("/api/v1/trees", "manager"), ("/api/v1/nothing", "manager"), ("/api/v1/trees", null) })
        {
            using var api = await service.Http.SendAsync(service.Request(HttpMethod.Get, path, role));
            Assert.Equal("nosniff", api.Headers.GetValues("X-Content-Type-Options").Single());
            Assert.Contains("frame-ancestors 'none'", api.Headers.GetValues("Content-Security-Policy").Single(), StringComparison.Ordinal);
            Assert.Equal("no-store", api.Headers.CacheControl?.ToString());
        }
    }

    [Fact]
    public async Task Metrics_need_an_admin_key_or_are_alone_on_a_port_of_their_own()
    {
        var port = FreePort();
        await using var service = await ServiceUnderTest.StartAsync(options: ["--Orchard:MetricsPort", port.ToString(System.Globalization.CultureInfo.InvariantCulture)]);
        using var scraper = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}") };
        using (var scrape = await scraper.GetAsync(new Uri("/metrics", UriKind.Relative)))
        {
            Assert.Equal(HttpStatusCode.OK, scrape.StatusCode);
            Assert.Contains("orchard_queue_depth", await scrape.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        }

        using (var api = await scraper.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", "manager")))
        {
            Assert.Equal(HttpStatusCode.NotFound, api.StatusCode);
        }

        using (var onService = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/metrics", "admin")))
        {
            Assert.Equal(HttpStatusCode.NotFound, onService.StatusCode);
        }
    }

    [Fact]
    [System.Runtime.Versioning.UnsupportedOSPlatform("windows")]
    public async Task A_first_admin_key_goes_to_an_owner_only_file_never_to_the_log_and_the_database_is_owner_only()
    {
        var folder = Path.Combine(Path.GetTempPath(), "orchard-hygiene-" + Guid.NewGuid().ToString("N"), "data");
        var port = FreePort();
        var info = new ProcessStartInfo("dotnet") { UseShellExecute = false, RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var arg in new[] { Path.Combine(AppContext.BaseDirectory, "orchard.dll"), "serve", "--urls", $"http://127.0.0.1:{port}", "--environment", "Production", "--Orchard:DataFolder", folder })
        {
            info.ArgumentList.Add(arg);
        }

        var output = new System.Collections.Concurrent.ConcurrentQueue<string>();
        using var process = Process.Start(info)!;
        process.OutputDataReceived += (_, e) => { if (e.Data is not null) { output.Enqueue(e.Data); } };
        process.ErrorDataReceived += (_, e) => { if (e.Data is not null) { output.Enqueue(e.Data); } };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        try
        {
            using var http = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}") };
            var until = DateTime.UtcNow + TimeSpan.FromSeconds(60);
            while (true)
            {
                try
                {
                    using var ready = await http.GetAsync(new Uri("/health/ready", UriKind.Relative));
                    if (ready.StatusCode == HttpStatusCode.OK)
                    {
                        break;
                    }
                }
                catch (HttpRequestException) when (DateTime.UtcNow < until && !process.HasExited)
                {
                    await Task.Delay(200);
                }
            }

            var keyFile = Path.Combine(folder, "bootstrap-admin-key.txt");
            Assert.True(File.Exists(keyFile), "the first admin key is written to the data folder: " + string.Join("\n", output));
            Assert.Equal(UnixFileMode.UserRead | UnixFileMode.UserWrite, File.GetUnixFileMode(keyFile));
            var secret = (await File.ReadAllLinesAsync(keyFile)).Single(l => l.StartsWith("ok_", StringComparison.Ordinal));
            using var request = new HttpRequestMessage(HttpMethod.Get, "/api/v1/api-keys");
            request.Headers.Add("X-Api-Key", secret);
            using var keys = await http.SendAsync(request);
            Assert.Equal(HttpStatusCode.OK, keys.StatusCode);

            await Task.Delay(300);
            Assert.DoesNotContain(output, line => line.Contains(secret, StringComparison.Ordinal) || line.Contains("ok_", StringComparison.Ordinal));
            Assert.Contains(output, line => line.Contains("bootstrap-admin-key.txt", StringComparison.Ordinal));

            foreach (var file in Directory.GetFiles(folder, "orchard.db*"))
            {
                Assert.True((UnixFileMode.UserRead | UnixFileMode.UserWrite) == File.GetUnixFileMode(file), $"{file}: {File.GetUnixFileMode(file)}");
            }

            Assert.Contains(Directory.GetFiles(folder), f => f.EndsWith("orchard.db-wal", StringComparison.Ordinal));
            Assert.Equal(UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute, File.GetUnixFileMode(folder));
        }
        finally
        {
            if (!process.HasExited)
            {
                process.Kill(entireProcessTree: true);
                await process.WaitForExitAsync();
            }

            Directory.Delete(Path.GetDirectoryName(folder)!, recursive: true);
        }
    }

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }
}
