using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Orchard.Core.Demo;

namespace Orchard.Service.Tests;

/// <summary>
/// A missed cut reported with the arm somewhere no re-plan can start from (a joint beyond its limit, the arm
/// sunk into the wood) gets a 422 problem naming the joint or what is touched, and nothing is recorded; the same
/// report from the cut pose itself is accepted and re-planned.
/// </summary>
public sealed class ReportedConfigurationTests
{
    [Fact]
    public async Task A_missed_cut_reported_outside_the_limits_is_refused_naming_the_joint_and_changes_nothing()
    {
        await using var service = await ServiceUnderTest.StartAsync();
        var tree = DemoScans.Tree(2).TreeId;
        using var posted = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(2))));
        var job = (await posted.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!;
        Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        using var got = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{tree}/schedule", "controller"));
        var schedule = await got.Content.ReadFromJsonAsync<JsonElement>();
        var version = schedule.GetProperty("version").GetInt32();
        var step = schedule.GetProperty("stops")[0].GetProperty("steps")[0];
        var cut = step.GetProperty("cutId").GetString()!;
        var atCut = step.GetProperty("cutConfiguration").EnumerateArray().Select(v => v.GetDouble()).ToArray();

        var arm = DemoArm.Create();
        var beyond = atCut.ToArray();
        beyond[3] = arm.Joints[3].UpperLimit + 0.3;
        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        using var refused = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version, cutId = cut, outcome = "missed", configuration = beyond })));
        Assert.Equal(HttpStatusCode.UnprocessableEntity, refused.StatusCode);
        Assert.Equal("application/problem+json", refused.Content.Headers.ContentType!.MediaType);
        var problem = await refused.Content.ReadFromJsonAsync<JsonElement>();
        var error = problem.GetProperty("errors").EnumerateArray().Single();
        Assert.Equal("$.configuration[3]", error.GetProperty("path").GetString());
        Assert.Equal("configuration.outsideLimits", error.GetProperty("code").GetString());
        Assert.Contains(arm.Joints[3].Name, error.GetProperty("message").GetString(), StringComparison.Ordinal);
        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));

        // From the cut pose itself (the shear on the branch) the re-plan is accepted: it backs out first.
        using var accepted = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version, cutId = cut, outcome = "missed", configuration = atCut })));
        Assert.Equal(HttpStatusCode.Accepted, accepted.StatusCode);
    }
}
