using System.Net;
using Orchard.Store.Tests;

namespace Orchard.Service.Tests;

/// <summary>When the database goes away, clients get 503 with Retry-After as a problem, never a 500.</summary>
public sealed class StoreOutageTests(PostgresServer server) : IClassFixture<PostgresServer>
{
    [Fact]
    public async Task A_lost_database_gives_503_with_retry_after()
    {
        var connection = await server.CreateDatabaseAsync();
        await using var service = await ServiceUnderTest.StartAsync(connection, workers: 0);
        await server.DropDatabaseAsync(connection);

        using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(0, cuts: 3))));
        Assert.Equal(HttpStatusCode.ServiceUnavailable, post.StatusCode);
        Assert.NotNull(post.Headers.RetryAfter);
        Assert.Equal("application/problem+json", post.Content.Headers.ContentType?.MediaType);

        using var ready = await service.Http.GetAsync(new Uri("/health/ready", UriKind.Relative));
        Assert.Equal(HttpStatusCode.ServiceUnavailable, ready.StatusCode);
    }
}
