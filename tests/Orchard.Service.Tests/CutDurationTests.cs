using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace Orchard.Service.Tests;

/// <summary>
/// Cut durations reported with outcomes teach the block's cut-time model: below the threshold (3 here, by
/// configuration) the estimate keeps the arm profile's cut seconds and says so; at it, the line through the
/// measured durations replaces them. The durations are made exactly 0.5 s + 0.05 s/mm · diameter, so the
/// fitted line is known by hand.
/// </summary>
public abstract class CutDurationTests
{
    private const string Block = "Kestrel Terrace";

    protected abstract Task<ServiceUnderTest> StartAsync(IReadOnlyList<string> arguments);

    private static double Measured(double diameterMm) => 0.5 + (0.05 * diameterMm);

    [Fact]
    public async Task Measured_durations_replace_the_planned_cut_seconds_once_enough_are_in()
    {
        await using var service = await StartAsync(["--Orchard:MinimumMeasuredCutsPerBlock", "3"]);
        var scan = DemoScans.Tree(0, cuts: 8);
        using var posted = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(DemoScans.Json(0, cuts: 8))));
        var job = (await posted.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("jobId").GetString()!;
        Assert.Equal("done", (await service.WaitForJobAsync(job, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        using var get = await service.Http.SendAsync(service.Request(HttpMethod.Get, $"/api/v1/trees/{scan.TreeId}/schedule", "controller"));
        var schedule = await get.Content.ReadFromJsonAsync<JsonElement>();
        var steps = schedule.GetProperty("stops").EnumerateArray().SelectMany(s => s.GetProperty("steps").EnumerateArray()).ToList();
        Assert.True(steps.Count >= 3, "three scheduled cuts to report");
        var diameter = scan.Cuts.ToDictionary(c => c.Id, c => c.DiameterMm);
        var reported = steps.Take(3).Select(s => s.GetProperty("cutId").GetString()!).ToList();
        Assert.True(reported.Max(c => diameter[c]) - reported.Min(c => diameter[c]) >= 2, "the reported cuts' diameters spread 2 mm or more");

        // Bad durations are refused by field and store nothing.
        await RefusedAsync(service, scan.TreeId, new { version = 1, cutId = reported[0], outcome = "done", durationSeconds = -1.0 }, HttpStatusCode.UnprocessableEntity, "duration.outOfRange");
        await RefusedAsync(service, scan.TreeId, new { version = 1, cutId = reported[0], outcome = "skipped", durationSeconds = 2.0 }, HttpStatusCode.UnprocessableEntity, "duration.notDone");
        await RefusedAsync(service, scan.TreeId, new { version = 1, cutId = reported[0], outcome = "done", durationSeconds = "long" }, HttpStatusCode.BadRequest, "json.type");
        Assert.Empty(await service.Store.ListCutDurationsAsync(CancellationToken.None));

        // Two measured cuts: fewer than the three needed; the estimate keeps the planned seconds and says why.
        foreach (var cut in reported.Take(2))
        {
            await DoneAsync(service, scan.TreeId, cut, Measured(diameter[cut]));
        }

        var before = await EstimatesAsync(service);
        var model = CutTimeModel(before);
        Assert.Equal(("armProfile", 2), (model.GetProperty("source").GetString(), model.GetProperty("measuredCuts").GetInt32()));
        Assert.Contains("2 measured cuts, fewer than the 3 needed", model.GetProperty("description").GetString(), StringComparison.Ordinal);
        var total = schedule.GetProperty("totalSeconds").GetDouble();
        Assert.Equal(total / 3600, Row(before).GetProperty("plannedHours").GetDouble(), 1e-12);

        // The third: the line through the three is 0.5 + 0.05·d, and every scheduled cut is counted by it.
        await DoneAsync(service, scan.TreeId, reported[2], Measured(diameter[reported[2]]));
        var after = await EstimatesAsync(service);
        model = CutTimeModel(after);
        Assert.Equal(("measured", 3), (model.GetProperty("source").GetString(), model.GetProperty("measuredCuts").GetInt32()));
        Assert.Equal(0.5, model.GetProperty("interceptSeconds").GetDouble(), 1e-9);
        Assert.Equal(0.05, model.GetProperty("secondsPerMm").GetDouble(), 1e-9);
        var plannedCutSeconds = steps.Sum(s => s.GetProperty("cutSeconds").GetDouble());
        var measuredCutSeconds = steps.Sum(s => Measured(diameter[s.GetProperty("cutId").GetString()!]));
        Assert.Equal((total - plannedCutSeconds + measuredCutSeconds) / 3600, Row(after).GetProperty("plannedHours").GetDouble(), 1e-9);
        Assert.NotEqual(Row(before).GetProperty("plannedHours").GetDouble(), Row(after).GetProperty("plannedHours").GetDouble());
    }

    private static async Task DoneAsync(ServiceUnderTest service, string tree, string cut, double seconds)
    {
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller",
            JsonContent.Create(new { version = 1, cutId = cut, outcome = "done", durationSeconds = seconds })));
        Assert.Equal(HttpStatusCode.Accepted, response.StatusCode);
    }

    private static async Task RefusedAsync(ServiceUnderTest service, string tree, object body, HttpStatusCode status, string code)
    {
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Post, $"/api/v1/trees/{tree}/outcomes", "controller", JsonContent.Create(body)));
        Assert.Equal(status, response.StatusCode);
        var error = Assert.Single((await response.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("errors").EnumerateArray());
        Assert.Equal(("$.durationSeconds", code), (error.GetProperty("path").GetString(), error.GetProperty("code").GetString()));
    }

    private static async Task<JsonElement> EstimatesAsync(ServiceUnderTest service)
    {
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/estimates", "manager"));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    private static JsonElement CutTimeModel(JsonElement view) =>
        view.GetProperty("cutTimeModels").EnumerateArray().Single(m => m.GetProperty("block").GetString() == Block);

    private static JsonElement Row(JsonElement view) => view.GetProperty("rows").EnumerateArray().Single(r => r.GetProperty("block").GetString() == Block);
}

/// <summary>Cut durations on the embedded SQLite store.</summary>
public sealed class SqliteCutDurationTests : CutDurationTests
{
    protected override Task<ServiceUnderTest> StartAsync(IReadOnlyList<string> arguments) => ServiceUnderTest.StartAsync(options: arguments);
}

/// <summary>Cut durations on PostgreSQL.</summary>
public sealed class PostgresCutDurationTests(Orchard.Store.Tests.PostgresServer server) : CutDurationTests, IClassFixture<Orchard.Store.Tests.PostgresServer>
{
    protected override async Task<ServiceUnderTest> StartAsync(IReadOnlyList<string> arguments) =>
        await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync(), options: arguments);
}
