using System.Net;

namespace Orchard.Service.Tests;

/// <summary>Every endpoint × every role, no key and a bad key: who may do what.</summary>
public sealed class RoleMatrixTests
{
    private static readonly string[] Callers = ["none", "bad", "tablet", "controller", "manager", "admin"];

    public static TheoryData<string, string, string> Endpoints => new()
    {
        { "POST", "/api/v1/scans", "tablet admin" },
        { "GET", "/api/v1/jobs/job-none", "tablet controller manager admin" },
        { "GET", "/api/v1/trees", "manager admin" },
        { "GET", "/api/v1/estimates", "manager admin" },
        { "GET", "/api/v1/estimates.csv", "manager admin" },
        { "GET", "/api/v1/trees/T-none/scan", "manager admin" },
        { "GET", "/api/v1/trees/T-none/schedule", "controller manager admin" },
        { "POST", "/api/v1/trees/T-none/outcomes", "controller admin" },
        { "PUT", "/api/v1/arm-profiles/x", "admin" },
        { "GET", "/api/v1/arm-profiles/x", "admin" },
        { "GET", "/api/v1/arm-profiles", "admin" },
        { "POST", "/api/v1/api-keys", "admin" },
        { "GET", "/api/v1/api-keys", "admin" },
        { "DELETE", "/api/v1/api-keys/key-none", "admin" },
        { "GET", "/api/v1/audit", "admin" },
        { "PUT", "/api/v1/rows", "admin" },
        { "GET", "/api/v1/rows", "manager admin" },
        { "PUT", "/api/v1/rates", "manager admin" },
        { "GET", "/api/v1/rates", "manager admin" },
    };

    private static readonly Lazy<Task<ServiceUnderTest>> Service = new(() => ServiceUnderTest.StartAsync());

    [Theory]
    [MemberData(nameof(Endpoints))]
    public async Task Each_role_gets_the_answer_it_should(string method, string path, string allowed)
    {
        var service = await Service.Value;
        var permitted = allowed.Split(' ');
        foreach (var caller in Callers)
        {
            var role = caller switch { "none" => null, "bad" => "ok_not_a_key", _ => caller };
            using var request = service.Request(new HttpMethod(method), path, role, method is "POST" or "PUT" ? ServiceUnderTest.Json("{}") : null);
            using var response = await service.Http.SendAsync(request);
            var expected = caller is "none" or "bad" ? HttpStatusCode.Unauthorized : permitted.Contains(caller) ? (HttpStatusCode?)null : HttpStatusCode.Forbidden;
            if (expected is { } status)
            {
                Assert.True(status == response.StatusCode, $"{caller} {method} {path}: {(int)response.StatusCode}, expected {(int)status}");
            }
            else
            {
                Assert.True(response.StatusCode is not (HttpStatusCode.Unauthorized or HttpStatusCode.Forbidden), $"{caller} {method} {path}: {(int)response.StatusCode}, expected to be let in");
            }

            if ((int)response.StatusCode >= 400)
            {
                Assert.Equal("application/problem+json", response.Content.Headers.ContentType?.MediaType);
            }
        }
    }
}
