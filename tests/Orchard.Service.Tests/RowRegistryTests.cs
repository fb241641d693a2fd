using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Orchard.Core.Estimates;
using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Store;

namespace Orchard.Service.Tests;

/// <summary>
/// The row registry and reference rates over HTTP, and the estimates that read them: problems name each bad
/// field and store nothing; the estimates take rows, spacing and rates from the registry and the store;
/// tree features are written when the scan is accepted and the plan completes, so an estimate parses nothing.
/// </summary>
public abstract class RowRegistryTests
{
    private const string Block = "Kestrel Terrace";

    protected abstract Task<ServiceUnderTest> StartAsync();

    private static RowRegistry Registry(double treeSpacingM, int treeCount = 5) => new(
    [
        new RegistryBlock(Block, [new RegistryRow("K1", TreeCount: treeCount), new RegistryRow("K2", LengthM: 40, Sides: RowSides.Near)],
            LengthM: 60, TreeSpacingM: treeSpacingM, RowSpacingM: 3.5, AlleyWidthM: 2.5, Sides: RowSides.Both),
    ]);

    private static async Task<HttpResponseMessage> PutAsync(ServiceUnderTest service, string path, string role, string json) =>
        await service.Http.SendAsync(service.Request(HttpMethod.Put, path, role, ServiceUnderTest.Json(json)));

    private static async Task<JsonElement> EstimatesAsync(ServiceUnderTest service, string query = "")
    {
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/estimates" + query, "manager"));
        Assert.Equal(HttpStatusCode.OK, response.StatusCode);
        return await response.Content.ReadFromJsonAsync<JsonElement>();
    }

    private static JsonElement Row(JsonElement view, string row) =>
        view.GetProperty("rows").EnumerateArray().Single(r => r.GetProperty("row").GetString() == row);

    [Fact]
    public async Task A_bad_registry_is_refused_field_by_field_and_the_stored_one_is_kept()
    {
        await using var service = await StartAsync();
        using (var good = await PutAsync(service, "/api/v1/rows", "admin", OrchardJson.Serialize(Registry(0.9))))
        {
            Assert.Equal(HttpStatusCode.OK, good.StatusCode);
            var saved = await good.Content.ReadFromJsonAsync<JsonElement>();
            Assert.Equal((1, 2), (saved.GetProperty("blocks").GetInt32(), saved.GetProperty("rows").GetInt32()));
        }

        using var unreadable = await PutAsync(service, "/api/v1/rows", "admin", """{"blocks": [{"id": "B", "treeSpacingM": "wide", "sides": "left", "rows": []}]}""");
        Assert.Equal(HttpStatusCode.BadRequest, unreadable.StatusCode);
        var unreadablePaths = await PathsAsync(unreadable);
        Assert.Equal(["$.blocks[0].sides", "$.blocks[0].treeSpacingM"], unreadablePaths.Order(StringComparer.Ordinal));

        using var invalid = await PutAsync(service, "/api/v1/rows", "admin", """
            {"blocks": [
              {"id": "B", "rowSpacingM": 3, "alleyWidthM": 3.5, "sides": "both", "treeSpacingM": 1,
               "rows": [{"id": "1", "lengthM": 50}, {"id": "1", "lengthM": -2}, {"id": "3"}, {"id": "4\u202E", "lengthM": 10}]},
              {"id": "B", "rows": []}
            ]}
            """);
        Assert.Equal(HttpStatusCode.UnprocessableEntity, invalid.StatusCode);
        Assert.Equal("application/problem+json", invalid.Content.Headers.ContentType!.MediaType);
        var paths = await PathsAsync(invalid);
        foreach (var expected in new[]
        {
            "$.blocks[0].rows[0].alleyWidthM", // wider than the row spacing
            "$.blocks[0].rows[1].id",          // duplicate
            "$.blocks[0].rows[1].lengthM",     // not positive
            "$.blocks[0].rows[2].lengthM",     // on neither the row nor its block
            "$.blocks[1].id",                  // duplicate block
            "$.blocks[0].rows[3].id",          // a bidi override in a row's name (names are held to the scans' rule)
        })
        {
            Assert.Contains(expected, paths);
        }

        using var stored = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/rows", "manager"));
        var registry = OrchardJson.Parse<RowRegistry>(await stored.Content.ReadAsStringAsync()).Value!;
        Assert.Equal(["K1", "K2"], registry.Blocks.Single().Rows.Select(r => r.Id));
    }

    [Fact]
    public async Task Estimates_take_rows_spacing_and_rates_from_the_registry_and_the_store()
    {
        await using var service = await StartAsync();
        using (var put = await PutAsync(service, "/api/v1/rows", "admin", OrchardJson.Serialize(Registry(0.9, treeCount: 5))))
        {
            Assert.Equal(HttpStatusCode.OK, put.StatusCode);
        }

        using (var rates = await PutAsync(service, "/api/v1/rates", "manager", """{"platformSpeedKmh": 3.6, "handSecondsPerCut": 30}"""))
        {
            Assert.Equal(HttpStatusCode.OK, rates.StatusCode);
            var stored = await rates.Content.ReadFromJsonAsync<JsonElement>();
            Assert.Equal(3.6, stored.GetProperty("platformSpeedKmh").GetDouble());
            Assert.Equal(EstimateSettings.Default.ManualSecondsPerTree, stored.GetProperty("manualSecondsPerTree").GetDouble());
        }

        // Registered, nothing scanned: K1 counts its 5 trees, K2 its 40 m / 0.9 m = 44. Settle 5 s a stop (the default).
        var view = await EstimatesAsync(service);
        var k1 = Row(view, "K1");
        Assert.True(k1.GetProperty("registered").GetBoolean());
        Assert.Equal(5, k1.GetProperty("trees").GetInt32());
        Assert.Equal(44, Row(view, "K2").GetProperty("trees").GetInt32());
        // Near pass only (no far-side stops): 4 gaps · 0.9 m at 1 m/s + 5 · 5 s = 28.6 s.
        Assert.Equal(28.6 / 3600, k1.GetProperty("moveHours").GetDouble(), 1e-12);
        Assert.Equal(60 * 3.5 / 10_000, k1.GetProperty("areaHa").GetDouble(), 1e-12);
        Assert.Equal(30, view.GetProperty("handSecondsPerCut").GetDouble());

        // A new spacing in the registry changes the estimate: 4 gaps · 1.2 m + 25 s = 29.8 s.
        using (var again = await PutAsync(service, "/api/v1/rows", "admin", OrchardJson.Serialize(Registry(1.2, treeCount: 5))))
        {
            Assert.Equal(HttpStatusCode.OK, again.StatusCode);
        }

        Assert.Equal(29.8 / 3600, Row(await EstimatesAsync(service), "K1").GetProperty("moveHours").GetDouble(), 1e-12);

        // A query value is a what-if: used for this answer, not stored.
        Assert.Equal(((4 * 1.2 / (1.8 / 3.6)) + 25) / 3600, Row(await EstimatesAsync(service, "?platformSpeedKmh=1.8"), "K1").GetProperty("moveHours").GetDouble(), 1e-12);
        Assert.Equal(3.6, (await EstimatesAsync(service)).GetProperty("platformSpeedKmh").GetDouble());

        using var badRates = await PutAsync(service, "/api/v1/rates", "manager", """{"platformSpeedKmh": -1, "handSecondsPerCut": "slow"}""");
        Assert.Equal(HttpStatusCode.BadRequest, badRates.StatusCode);
        using var outOfRange = await PutAsync(service, "/api/v1/rates", "manager", """{"platformSpeedKmh": -1, "manualSecondsPerTree": 0}""");
        Assert.Equal(HttpStatusCode.UnprocessableEntity, outOfRange.StatusCode);
        Assert.Equal(["$.manualSecondsPerTree", "$.platformSpeedKmh"], (await PathsAsync(outOfRange)).Order(StringComparer.Ordinal));
        Assert.Equal(3.6, (await EstimatesAsync(service)).GetProperty("platformSpeedKmh").GetDouble());
    }

    [Fact]
    public async Task Tree_features_are_written_at_intake_and_plan_so_an_estimate_works_nothing_out()
    {
        await using var service = await StartAsync();
        using (var put = await PutAsync(service, "/api/v1/rows", "admin", OrchardJson.Serialize(Registry(0.9))))
        {
            Assert.Equal(HttpStatusCode.OK, put.StatusCode);
        }

        var scan = DemoScans.Tree(0, cuts: 4);
        using var posted = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(OrchardJson.Serialize(scan))));
        Assert.Equal(HttpStatusCode.Accepted, posted.StatusCode);
        var accepted = await posted.Content.ReadFromJsonAsync<JsonElement>();
        var scanId = accepted.GetProperty("scanId").GetString();
        Assert.Equal("done", (await service.WaitForJobAsync(accepted.GetProperty("jobId").GetString()!, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());

        // Written by the intake and by the worker just after it writes the plan (the job reads done a moment
        // before), before anyone asked for an estimate.
        var features = Assert.Single(await service.Store.ListTreeFeaturesAsync(CancellationToken.None));
        for (var i = 0; i < 100 && features.ScheduleVersion is null; i++)
        {
            await Task.Delay(100);
            features = Assert.Single(await service.Store.ListTreeFeaturesAsync(CancellationToken.None));
        }

        Assert.Equal((scan.TreeId, scanId, 1), (features.TreeId, features.ScanId, features.ScheduleVersion));
        Assert.Equal(new ScanFeatures(4, ScanFeatures.Of(scan).BranchLengthM, scan.Nodes.Count), features.Scan);
        Assert.NotNull(features.Schedule);

        var view = await EstimatesAsync(service);
        Assert.Equal(0, view.GetProperty("featuresRefreshed").GetInt32());
        var k1 = Row(view, "K1");
        Assert.Equal(1, k1.GetProperty("plannedTrees").GetInt32());
        Assert.Equal(features.Schedule!.TotalSeconds / 3600, k1.GetProperty("plannedHours").GetDouble(), 1e-12);
        Assert.Equal(features.Schedule.ScheduledCuts, k1.GetProperty("plannedCuts").GetInt32());
    }

    [Fact]
    public async Task Trees_without_stored_features_are_worked_out_once_and_unregistered_rows_are_flagged()
    {
        await using var service = await StartAsync();

        // A scan stored behind the API's back (as an older build would have left it): no features yet.
        var scan = DemoScans.Tree(2, cuts: 3) with { Row = "K9" };
        Assert.True((await service.Store.AcceptScanAsync(
            new ScanSubmission("scan-old", "job-old", scan.TreeId, scan.Block, scan.Row, scan.PositionInRow, Orchard.Core.Demo.DemoArm.Id, OrchardJson.Serialize(scan), Orchard.Core.Sequencing.RetryPolicy.RetryLast),
            null, CancellationToken.None)).Accepted);
        Assert.Empty(await service.Store.ListTreeFeaturesAsync(CancellationToken.None));

        var first = await EstimatesAsync(service);
        Assert.True(first.GetProperty("featuresRefreshed").GetInt32() >= 1);
        var k9 = Row(first, "K9");
        Assert.False(k9.GetProperty("registered").GetBoolean());
        Assert.False(first.GetProperty("orchard").GetProperty("registered").GetBoolean());

        // Once the tree is planned and recorded, nothing is worked out again.
        var until = DateTime.UtcNow.AddSeconds(90);
        while ((await service.Store.GetTreeAsync(scan.TreeId, CancellationToken.None))!.CurrentVersion is null && DateTime.UtcNow < until)
        {
            await Task.Delay(200);
        }

        await EstimatesAsync(service);
        Assert.Equal(0, (await EstimatesAsync(service)).GetProperty("featuresRefreshed").GetInt32());
        Assert.Equal(3, Assert.Single(await service.Store.ListTreeFeaturesAsync(CancellationToken.None)).Scan!.CutCount);
    }

    private static async Task<List<string>> PathsAsync(HttpResponseMessage response)
    {
        var problem = await response.Content.ReadFromJsonAsync<JsonElement>();
        return problem.GetProperty("errors").EnumerateArray().Select(e => e.GetProperty("path").GetString()!).ToList();
    }
}

/// <summary>The row registry on the embedded SQLite store.</summary>
public sealed class SqliteRowRegistryTests : RowRegistryTests
{
    protected override Task<ServiceUnderTest> StartAsync() => ServiceUnderTest.StartAsync();
}

/// <summary>The row registry on PostgreSQL.</summary>
public sealed class PostgresRowRegistryTests(Orchard.Store.Tests.PostgresServer server) : RowRegistryTests, IClassFixture<Orchard.Store.Tests.PostgresServer>
{
    protected override async Task<ServiceUnderTest> StartAsync() => await ServiceUnderTest.StartAsync(await server.CreateDatabaseAsync());
}
