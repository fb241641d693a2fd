using System.Net;
using Orchard.Service.Bench;

namespace Orchard.Service.Tests;

/// <summary>The load generator itself: counts, percentiles, and latency charged from the due time.</summary>
public sealed class FixedRateLoadTests
{
    [Fact]
    public void Nearest_rank_percentiles_match_the_worked_example()
    {
        // Nearest-rank method on the list 15, 20, 35, 40, 50 (the common textbook example; values recalled
        // from memory): P30 = 20, P40 = 20, P50 = 35, P100 = 50, and P5 is the first value.
        double[] sorted = [15, 20, 35, 40, 50];
        Assert.Equal(15, FixedRateLoad.NearestRank(sorted, 0.05));
        Assert.Equal(20, FixedRateLoad.NearestRank(sorted, 0.30));
        Assert.Equal(20, FixedRateLoad.NearestRank(sorted, 0.40));
        Assert.Equal(35, FixedRateLoad.NearestRank(sorted, 0.50));
        Assert.Equal(50, FixedRateLoad.NearestRank(sorted, 1.00));
        Assert.True(double.IsNaN(FixedRateLoad.NearestRank([], 0.5)));
    }

    [Fact]
    public async Task Every_due_request_is_sent_and_counted_by_status()
    {
        using var http = new HttpClient(new Answering(_ => HttpStatusCode.OK, TimeSpan.Zero, parallel: true)) { BaseAddress = new Uri("http://127.0.0.1/") };
        var phase = new LoadPhase("ok", 400, TimeSpan.FromSeconds(0.5), i => new HttpRequestMessage(HttpMethod.Get, "/" + i));
        var result = await FixedRateLoad.RunAsync(http, phase, s => s == 200, CancellationToken.None);
        Assert.Equal(200, result.Sent);
        Assert.Equal(200, result.Succeeded);
        Assert.Equal(0, result.Errors);
        Assert.Equal(200, result.Statuses["200"]);
    }

    [Fact]
    public async Task Server_errors_and_dropped_connections_are_errors()
    {
        using var http = new HttpClient(new Answering(i => (i % 3) switch { 0 => HttpStatusCode.OK, 1 => HttpStatusCode.InternalServerError, _ => (HttpStatusCode)(-1) }, TimeSpan.Zero, parallel: true))
        {
            BaseAddress = new Uri("http://127.0.0.1/"),
        };
        var phase = new LoadPhase("mixed", 300, TimeSpan.FromSeconds(0.3), i => new HttpRequestMessage(HttpMethod.Get, "/" + i));
        var result = await FixedRateLoad.RunAsync(http, phase, s => s == 200, CancellationToken.None);
        Assert.Equal(90, result.Sent);
        Assert.Equal(30, result.Succeeded);
        Assert.Equal(60, result.Errors);
        Assert.Equal(30, result.Statuses["500"]);
        Assert.Equal(30, result.Statuses["no answer"]);
    }

    [Fact]
    public async Task A_server_that_falls_behind_shows_its_queue_in_the_latency()
    {
        // One request at a time, 50 ms each, offered 100 a second for 1 s: the server can answer 20 a
        // second, so the last of the 100 is answered about 5 s after the first was due, about 4 s after it
        // was itself due. A closed-loop client would report 50 ms for every request.
        using var http = new HttpClient(new Answering(_ => HttpStatusCode.OK, TimeSpan.FromMilliseconds(50), parallel: false)) { BaseAddress = new Uri("http://127.0.0.1/") };
        var phase = new LoadPhase("slow", 100, TimeSpan.FromSeconds(1), i => new HttpRequestMessage(HttpMethod.Get, "/" + i));
        var result = await FixedRateLoad.RunAsync(http, phase, s => s == 200, CancellationToken.None);
        Assert.Equal(100, result.Succeeded);
        Assert.True(result.LatencyP99Ms > 2000, $"p99 {result.LatencyP99Ms:F0} ms counts the time spent queued");
        Assert.True(result.AchievedPerSecond < 40, $"achieved {result.AchievedPerSecond:F0}/s is what the server could do, not what was offered");
    }

    /// <summary>An in-memory server: answers by request number with the given status after a delay; status -1 drops the connection.</summary>
    private sealed class Answering(Func<long, HttpStatusCode> status, TimeSpan delay, bool parallel) : HttpMessageHandler
    {
        private readonly SemaphoreSlim gate = new(parallel ? int.MaxValue : 1);

        protected override async Task<HttpResponseMessage> SendAsync(HttpRequestMessage request, CancellationToken cancellationToken)
        {
            await gate.WaitAsync(cancellationToken);
            try
            {
                if (delay > TimeSpan.Zero)
                {
                    await Task.Delay(delay, cancellationToken);
                }

                var code = status(long.Parse(request.RequestUri!.AbsolutePath.TrimStart('/'), System.Globalization.CultureInfo.InvariantCulture));
                return (int)code < 0 ? throw new HttpRequestException("connection reset") : new HttpResponseMessage(code) { Content = new StringContent("x") };
            }
            finally
            {
                gate.Release();
            }
        }

        protected override void Dispose(bool disposing)
        {
            gate.Dispose();
            base.Dispose(disposing);
        }
    }
}
