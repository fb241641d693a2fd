using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>
/// Limits that keep one client from crowding out the rest: failed authentication per address (random keys
/// are throttled, a key the address already uses keeps working); a review session's own request bucket;
/// each key's quota of open plan jobs (429 with Retry-After); and the planning deadline, past which the
/// schedule planned so far is stored, marked partial, with the reason.
/// </summary>
public sealed class LimitsTests
{
    [Fact]
    public async Task Random_keys_are_throttled_per_address_while_a_key_in_use_keeps_working()
    {
        await using var service = await ServiceUnderTest.StartAsync(options: ["--Orchard:FailedAuthPerMinute", "5"]);
        using (var warm = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "tablet")))
        {
            Assert.Equal(HttpStatusCode.NotFound, warm.StatusCode);
        }

        var statuses = new List<HttpStatusCode>();
        HttpResponseMessage? limited = null;
        for (var i = 0; i < 8; i++)
        {
            var response = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", $"ok_guess_{i:D4}"));
            statuses.Add(response.StatusCode);
            if (response.StatusCode == HttpStatusCode.TooManyRequests && limited is null)
            {
                limited = response;
            }
            else
            {
                response.Dispose();
            }
        }

        Assert.Equal([.. Enumerable.Repeat(HttpStatusCode.Unauthorized, 5), .. Enumerable.Repeat(HttpStatusCode.TooManyRequests, 3)], statuses);
        Assert.NotNull(limited);
        Assert.True(limited!.Headers.RetryAfter?.Delta > TimeSpan.Zero, "Retry-After is set");
        Assert.Equal("application/problem+json", limited.Content.Headers.ContentType?.MediaType);
        limited.Dispose();

        // The key this address already used still works; a request without a key is just unauthenticated;
        // signing in from this address is blocked too.
        using (var known = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "tablet")))
        {
            Assert.Equal(HttpStatusCode.NotFound, known.StatusCode);
        }

        using (var none = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees", null)))
        {
            Assert.Equal(HttpStatusCode.Unauthorized, none.StatusCode);
        }

        using var page = new PageClient(service.Http.BaseAddress!);
        using var signIn = await page.SignInAsync(service.Keys["manager"]);
        Assert.Equal(HttpStatusCode.TooManyRequests, signIn.StatusCode);
    }

    [Fact]
    public async Task A_review_session_has_its_own_bucket_apart_from_the_addresses_anonymous_one()
    {
        await using var service = await ServiceUnderTest.StartAsync(options: ["--Orchard:AnonymousRequestsPerMinute", "6"]);
        using var page = new PageClient(service.Http.BaseAddress!);
        using (var signIn = await page.SignInAsync(service.Keys["manager"]))
        {
            Assert.Equal(HttpStatusCode.Redirect, signIn.StatusCode);
        }

        // Anonymous requests from the same address use up their allowance ...
        using var stranger = new HttpClient { BaseAddress = service.Http.BaseAddress };
        var anonymous = new List<HttpStatusCode>();
        for (var i = 0; i < 8; i++)
        {
            using var response = await stranger.GetAsync(new Uri("/review/style.css", UriKind.Relative));
            anonymous.Add(response.StatusCode);
        }

        Assert.Contains(HttpStatusCode.TooManyRequests, anonymous);

        // ... and the manager's session still reads.
        using var trees = await page.Http.GetAsync(new Uri("/api/v1/trees", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, trees.StatusCode);
    }

    [Fact]
    public async Task A_key_at_its_queue_quota_gets_429_with_retry_after_and_nothing_is_stored()
    {
        await using var service = await ServiceUnderTest.StartAsync(workers: 0, maxOpenJobsPerKey: 2);
        foreach (var index in new[] { 0, 2 })
        {
            using var accepted = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(index, cuts: 2))));
            Assert.Equal(HttpStatusCode.Accepted, accepted.StatusCode);
        }

        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        using var refused = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(4, cuts: 2)), "third"));
        Assert.Equal(HttpStatusCode.TooManyRequests, refused.StatusCode);
        Assert.Equal(TimeSpan.FromSeconds(30), refused.Headers.RetryAfter?.Delta);
        var error = (await refused.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("errors")[0];
        Assert.Equal(("$header.X-Api-Key", "quota.openJobs"), (error.GetProperty("path").GetString(), error.GetProperty("code").GetString()));
        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));

        // Another key has its own quota.
        using var other = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "admin", ServiceUnderTest.Json(DemoScans.Json(4, cuts: 2))));
        Assert.Equal(HttpStatusCode.Accepted, other.StatusCode);
    }

    [Fact]
    public async Task Past_the_planning_deadline_the_schedule_so_far_is_stored_partial_with_the_reason()
    {
        await using var service = await ServiceUnderTest.StartAsync(options: ["--Orchard:PlanningDeadlineSeconds", "0.001"]);
        using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(6, cuts: 12))));
        var accepted = await post.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal("done", (await service.WaitForJobAsync(accepted.GetProperty("jobId").GetString()!, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        var (_, schedule) = await ScheduleIntegrityTests.GetScheduleAsync(service, accepted.GetProperty("treeId").GetString()!);
        // A deadline this short stops the planner before any cut is ordered: the core then says nothing was
        // scheduled; either way the schedule is stored (not failed) and names the deadline as the reason.
        Assert.True(schedule.GetProperty("status").GetString() is "partial" or "nothingScheduled", schedule.GetProperty("status").GetString());
        Assert.Contains(schedule.GetProperty("problems").EnumerateArray(), p => p.GetProperty("code").GetString() == "planningDeadline");
    }
}
