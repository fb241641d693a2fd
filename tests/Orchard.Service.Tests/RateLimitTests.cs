using System.Net;

namespace Orchard.Service.Tests;

/// <summary>Per-key rate limits: past the limit, 429 with Retry-After, as a problem; other keys are not affected.</summary>
public sealed class RateLimitTests
{
    [Fact]
    public async Task A_key_past_its_limit_gets_429_with_retry_after()
    {
        // Four key-making calls at start-up use the admin key's allowance; the tablet's is its own.
        await using var service = await ServiceUnderTest.StartAsync(requestsPerMinute: 6);
        var statuses = new List<HttpStatusCode>();
        HttpResponseMessage? limited = null;
        for (var i = 0; i < 8; i++)
        {
            var response = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "tablet"));
            statuses.Add(response.StatusCode);
            if (response.StatusCode == HttpStatusCode.TooManyRequests)
            {
                limited ??= response;
            }
            else
            {
                response.Dispose();
            }
        }

        Assert.Equal(6, statuses.Count(s => s == HttpStatusCode.NotFound));
        Assert.Equal(2, statuses.Count(s => s == HttpStatusCode.TooManyRequests));
        Assert.NotNull(limited);
        Assert.True(limited!.Headers.RetryAfter is not null, "Retry-After is set");
        Assert.Equal("application/problem+json", limited.Content.Headers.ContentType?.MediaType);
        limited.Dispose();

        // Another key still gets through.
        using var other = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "controller"));
        Assert.Equal(HttpStatusCode.NotFound, other.StatusCode);
    }
}
