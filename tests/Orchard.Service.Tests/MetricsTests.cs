using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>Operators scrape /metrics (Prometheus text, with an admin key): queue depth, oldest job age, plan durations, moves by planning method.</summary>
public sealed class MetricsTests
{
    [Fact]
    public async Task A_planned_tree_shows_up_in_the_metrics()
    {
        await using var service = await ServiceUnderTest.StartAsync();
        using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(4, cuts: 4))));
        var job = (await post.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!;
        Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());

        using (var anonymous = await service.Http.GetAsync(new Uri("/metrics", UriKind.Relative)))
        {
            Assert.Equal(System.Net.HttpStatusCode.Unauthorized, anonymous.StatusCode);
        }

        using var scrape = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/metrics", "admin"));
        var text = await scrape.Content.ReadAsStringAsync();
        foreach (var name in new[] { "orchard_queue_depth", "orchard_queue_oldest_age_seconds", "orchard_plan_duration_seconds_count", "orchard_jobs_total", "orchard_moves_total", "orchard_move_plans_total" })
        {
            Assert.Contains(name, text, StringComparison.Ordinal);
        }

        Assert.Contains("outcome=\"done\"", text, StringComparison.Ordinal);
    }
}
