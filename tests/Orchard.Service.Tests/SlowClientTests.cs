using System.Net.Sockets;
using System.Text;

namespace Orchard.Service.Tests;

/// <summary>
/// Slow clients over a raw socket: a body that trickles in far below Kestrel's minimum data rate
/// (240 bytes/s after a 5 s grace period, its default) is cut off with a 408 problem, not left to hold a
/// connection and a request thread; nothing is stored and the service answers others meanwhile.
/// </summary>
public sealed class SlowClientTests
{
    [Fact]
    [Trait("Category", "Reliability")]
    public async Task A_trickling_body_is_timed_out_with_a_408_problem_and_nothing_stored()
    {
        await using var service = await ServiceUnderTest.StartAsync(workers: 0);
        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        var address = service.Http.BaseAddress!;
        using var client = new TcpClient();
        await client.ConnectAsync(address.Host, address.Port);
        await using var stream = client.GetStream();
        var head = $"POST /api/v1/scans HTTP/1.1\r\nHost: {address.Authority}\r\nX-Api-Key: {service.Keys["tablet"]}\r\n" +
                   "Content-Type: application/json\r\nContent-Length: 100000\r\n\r\n";
        await stream.WriteAsync(Encoding.ASCII.GetBytes(head));

        // One byte every 500 ms, while another client is served normally.
        var answer = new StringBuilder();
        var buffer = new byte[4096];
        var reading = stream.ReadAsync(buffer).AsTask();
        var until = DateTime.UtcNow + TimeSpan.FromSeconds(30);
        var sent = 0;
        while (!reading.IsCompleted && DateTime.UtcNow < until)
        {
            try
            {
                await stream.WriteAsync("{"u8.ToArray());
                sent++;
            }
            catch (IOException)
            {
                break; // The server closed the connection.
            }

            using var health = await service.Http.GetAsync(new Uri("/health/live", UriKind.Relative));
            Assert.True(health.IsSuccessStatusCode, "other clients are served while one trickles");
            await Task.WhenAny(reading, Task.Delay(500));
        }

        Assert.True(reading.IsCompleted, $"the server answered or closed within 30 s ({sent} bytes sent)");
        for (var n = await reading; n > 0; n = await stream.ReadAsync(buffer))
        {
            answer.Append(Encoding.UTF8.GetString(buffer, 0, n));
            if (answer.ToString().Contains("\r\n\r\n", StringComparison.Ordinal) && answer.ToString().Contains('}', StringComparison.Ordinal))
            {
                break;
            }
        }

        var text = answer.ToString();
        Assert.StartsWith("HTTP/1.1 408", text, StringComparison.Ordinal);
        Assert.Contains("application/problem+json", text, StringComparison.Ordinal);
        Assert.True(sent < 100, $"cut off after {sent} of 100,000 bytes");
        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));
    }
}
