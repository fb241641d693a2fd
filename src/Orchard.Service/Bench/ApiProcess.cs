using System.Diagnostics;
using System.Globalization;
using System.Net;
using System.Net.Sockets;

namespace Orchard.Service.Bench;

/// <summary>
/// An <c>orchard serve</c> process of its own on a free loopback port, so a load run measures the API
/// process alone (its peak memory included) and not the generator sharing its runtime.
/// </summary>
internal sealed class ApiProcess : IAsyncDisposable
{
    private readonly Process process;

    private ApiProcess(Process process, Uri address)
    {
        this.process = process;
        Address = address;
    }

    public Uri Address { get; }

    public int ProcessId => process.Id;

    /// <summary>Starts <c>orchard serve</c> (this build's, or <paramref name="assembly"/>) with the given configuration options and waits until it is ready.</summary>
    public static async Task<ApiProcess> StartAsync(IEnumerable<string> options, string? assembly, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(options);
        var port = FreeLoopbackPort();
        var address = new Uri($"http://127.0.0.1:{port.ToString(CultureInfo.InvariantCulture)}/");
        var info = new ProcessStartInfo("dotnet")
        {
            UseShellExecute = false,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var word in new[] { assembly ?? Path.Combine(AppContext.BaseDirectory, "orchard.dll"), "serve", "--urls", address.ToString().TrimEnd('/'), "--environment", "Production", "--Orchard:LogLevel", "Warning" }.Concat(options))
        {
            info.ArgumentList.Add(word);
        }

        var process = Process.Start(info) ?? throw new InvalidOperationException("could not start orchard serve");
        var errors = new System.Collections.Concurrent.ConcurrentQueue<string>();
        process.OutputDataReceived += (_, _) => { };
        process.ErrorDataReceived += (_, e) => { if (e.Data is not null && errors.Count < 50) { errors.Enqueue(e.Data); } };
        process.BeginOutputReadLine();
        process.BeginErrorReadLine();
        var api = new ApiProcess(process, address);

        using var probe = new HttpClient { BaseAddress = address, Timeout = TimeSpan.FromSeconds(5) };
        var until = DateTime.UtcNow + TimeSpan.FromSeconds(120);
        while (true)
        {
            if (process.HasExited)
            {
                throw new InvalidOperationException($"orchard serve exited with {process.ExitCode}: {string.Join(Environment.NewLine, errors)}");
            }

            try
            {
                using var ready = await probe.GetAsync(new Uri("/health/ready", UriKind.Relative), cancellationToken);
                if (ready.StatusCode == HttpStatusCode.OK)
                {
                    return api;
                }
            }
            catch (HttpRequestException)
            {
                // Not listening yet.
            }
            catch (TaskCanceledException) when (!cancellationToken.IsCancellationRequested)
            {
                // Slow to answer while starting.
            }

            if (DateTime.UtcNow > until)
            {
                await api.DisposeAsync();
                throw new InvalidOperationException("orchard serve was not ready within 120 s");
            }

            await Task.Delay(100, cancellationToken);
        }
    }

    /// <summary>The process's peak resident memory so far (VmHWM from /proc), in bytes; null where /proc is not there.</summary>
    public long? PeakResidentBytes() => ProcStatusKilobytes("VmHWM:") * 1024;

    /// <summary>Its resident memory now (VmRSS), in bytes.</summary>
    public long? ResidentBytes() => ProcStatusKilobytes("VmRSS:") * 1024;

    /// <summary>Asks it to stop (SIGTERM, as an orchestrator would) and waits; kills it if it does not.</summary>
    public async Task StopAsync()
    {
        if (process.HasExited)
        {
            return;
        }

        using (var term = Process.Start("kill", ["-TERM", process.Id.ToString(CultureInfo.InvariantCulture)]))
        {
            await term!.WaitForExitAsync();
        }

        using var grace = new CancellationTokenSource(TimeSpan.FromSeconds(30));
        try
        {
            await process.WaitForExitAsync(grace.Token);
        }
        catch (OperationCanceledException)
        {
            process.Kill(entireProcessTree: true);
        }
    }

    public async ValueTask DisposeAsync()
    {
        try
        {
            await StopAsync();
        }
        finally
        {
            process.Dispose();
        }
    }

    private long? ProcStatusKilobytes(string field)
    {
        var path = $"/proc/{process.Id.ToString(CultureInfo.InvariantCulture)}/status";
        if (process.HasExited || !File.Exists(path))
        {
            return null;
        }

        foreach (var line in File.ReadLines(path))
        {
            if (line.StartsWith(field, StringComparison.Ordinal))
            {
                return long.Parse(line[field.Length..].Trim().Split(' ')[0], CultureInfo.InvariantCulture);
            }
        }

        return null;
    }

    private static int FreeLoopbackPort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }
}
