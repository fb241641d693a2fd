using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using Orchard.Core.Model;
using Orchard.Core.Serialization;

namespace Orchard.Service.Tests;

/// <summary>Bad input gets a 4xx problem naming each bad field, and the store is unchanged row for row.</summary>
public sealed class BadInputTests
{
    // No planning worker: a scan another test here accepts would otherwise be planned in the background and
    // write its schedule between one test's two row counts. Nothing here needs a plan.
    private static readonly Lazy<Task<ServiceUnderTest>> Service = new(() => ServiceUnderTest.StartAsync(maxBodyBytes: 256 * 1024, workers: 0));

    public static TheoryData<string, string, int, string?> Cases()
    {
        var valid = DemoScans.Tree(0);
        var cycle = valid with { Branches = [.. valid.Branches, new Branch("loop", valid.Branches[^1].ToNode, valid.Branches[0].ToNode, 0.003, 0.003)] };
        var badRadius = valid with { Branches = [valid.Branches[0] with { FromRadiusM = -1 }, .. valid.Branches.Skip(1)] };
        return new TheoryData<string, string, int, string?>
        {
            { "malformed JSON", "{\"treeId\": \"x\", ", 400, "$" },
            { "wrong type", "{\"treeId\": 5}", 400, "$.treeId" },
            { "wrong nested type", "{\"nodes\": [{\"id\": \"n0\", \"xM\": \"far\"}]}", 400, "$.nodes[0].xM" },
            { "invalid graph", OrchardJson.Serialize(cycle), 422, $"$.branches[{cycle.Branches.Count - 1}].toNode" },
            { "negative radius", OrchardJson.Serialize(badRadius), 422, "$.branches[0].fromRadiusM" },
            { "missing fields", "{\"treeId\": \"x\"}", 422, "$.nodes" },
            { "a member twice in another case", Json(valid).Replace("\"nodes\":", "\"Nodes\":[],\"nodes\":", StringComparison.Ordinal), 400, "$.nodes" },
            { "a member twice", Json(valid).Replace("\"row\":", "\"row\":\"R9\",\"row\":", StringComparison.Ordinal), 400, "$.row" },
            { "an unknown member", Json(valid).Replace("\"xM\":", "\"colour\":\"red\",\"xM\":", StringComparison.Ordinal), 400, "$.nodes[0].colour" },
            { "an unknown member at the top", Json(valid).TrimEnd('}') + ",\"notes\":{\"big\":[1,2,3]}}", 400, "$.notes" },
            { "a bidi override in the tree id", Json(valid with { TreeId = "\u202E100-1K" }), 422, "$.treeId" },
            { "a zero-width space in a cut id", Json(valid with { Cuts = [valid.Cuts[0] with { Id = "c\u200B01" }, .. valid.Cuts.Skip(1)] }), 422, "$.cuts[0].id" },
            { "a decomposed letter in the tree id", Json(valid with { TreeId = "K1-cafe\u0301" }), 422, "$.treeId" },
            { "a leading space in the tree id", Json(valid with { TreeId = " K1-001" }), 422, "$.treeId" },
            { "a slash in the tree id", Json(valid with { TreeId = "K1/001" }), 422, "$.treeId" },
            { "oversize body", "{\"treeId\": \"" + new string('x', 400 * 1024) + "\"}", 413, null },
        };
    }

    private static string Json(TreeScan scan) => OrchardJson.Serialize(scan);

    [Theory]
    [MemberData(nameof(Cases))]
    public async Task A_bad_scan_is_refused_by_field_and_nothing_is_stored(string what, string body, int status, string? path)
    {
        var service = await Service.Value;
        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(body)));
        Assert.True(status == (int)response.StatusCode, $"{what}: {(int)response.StatusCode}");
        Assert.Equal("application/problem+json", response.Content.Headers.ContentType?.MediaType);
        if (path is not null)
        {
            var problem = await response.Content.ReadFromJsonAsync<JsonElement>();
            var paths = problem.GetProperty("errors").EnumerateArray().Select(e => e.GetProperty("path").GetString()).ToList();
            Assert.Contains(path, paths);
        }

        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));
    }

    [Fact]
    public async Task Invalid_utf8_is_refused_at_its_field_never_replaced()
    {
        var service = await Service.Value;
        var before = await service.Store.CountRowsAsync(CancellationToken.None);
        var body = System.Text.Encoding.UTF8.GetBytes(Json(DemoScans.Tree(0) with { TreeId = "K1-0XX" }));
        var at = Array.IndexOf(body, (byte)'X');
        body[at] = 0xC3;
        body[at + 1] = 0x28;
        using var content = new ByteArrayContent(body);
        content.Headers.ContentType = new System.Net.Http.Headers.MediaTypeHeaderValue("application/json");
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", content));
        Assert.Equal(HttpStatusCode.BadRequest, response.StatusCode);
        var error = (await response.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("errors")[0];
        Assert.Equal(("$.treeId", "utf8.invalid"), (error.GetProperty("path").GetString(), error.GetProperty("code").GetString()));
        Assert.Equal(before, await service.Store.CountRowsAsync(CancellationToken.None));
    }

    [Theory]
    [InlineData("/api/v1/trees/a%2Fb/schedule", "$path.treeId")]
    [InlineData("/api/v1/trees/%20K1-001/scan", "$path.treeId")]
    [InlineData("/api/v1/trees/K1-001%E2%80%AE/schedule", "$path.treeId")]
    [InlineData("/api/v1/jobs/job%2F1", "$path.jobId")]
    [InlineData("/api/v1/arm-profiles/arm%7Cx", "$path.armId")]
    public async Task An_address_with_an_id_off_the_pattern_gets_422_naming_it(string path, string field)
    {
        var service = await Service.Value;
        using var response = await service.Http.SendAsync(service.Request(HttpMethod.Get, path, "admin"));
        Assert.Equal(HttpStatusCode.UnprocessableEntity, response.StatusCode);
        var problem = await response.Content.ReadFromJsonAsync<JsonElement>();
        var error = problem.GetProperty("errors")[0];
        Assert.Equal((field, "id.pattern"), (error.GetProperty("path").GetString(), error.GetProperty("code").GetString()));
        Assert.Contains(Orchard.Core.Validation.IdPattern.Expression, error.GetProperty("message").GetString(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task The_stored_scan_is_the_canonical_document_read_not_the_body_sent()
    {
        var service = await Service.Value;
        var scan = DemoScans.Tree(1, cuts: 2) with { TreeId = "K1-canonical" };
        // Members in other cases and order, spaces and escapes: read the same, stored as the one shape.
        var sent = Json(scan).Replace("\"treeId\":", "\"TreeID\" :", StringComparison.Ordinal).Replace(",", " ,\n ", StringComparison.Ordinal).Replace("K1-canonical", "K1-\\u0063anonical", StringComparison.Ordinal);
        using var post = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(sent)));
        Assert.Equal(HttpStatusCode.Accepted, post.StatusCode);
        using var stored = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/trees/K1-canonical/scan", "manager"));
        Assert.Equal(Json(scan), await stored.Content.ReadAsStringAsync());
    }

    [Fact]
    public async Task Every_wrong_type_is_listed_in_one_answer_with_the_JSON_type_expected()
    {
        var service = await Service.Value;
        using var scan = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet",
            ServiceUnderTest.Json("""{"treeId": 5, "cuts": [{"kind": "lopping", "diameterMm": "thick"}]}""")));
        var scanProblem = await scan.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal(HttpStatusCode.BadRequest, scan.StatusCode);
        var scanErrors = scanProblem.GetProperty("errors").EnumerateArray().ToDictionary(e => e.GetProperty("path").GetString()!, e => e.GetProperty("message").GetString()!);
        Assert.Equal("Expected a string; found the number 5.", scanErrors["$.treeId"]);
        Assert.StartsWith("Expected a string, one of \"thinning\"", scanErrors["$.cuts[0].kind"], StringComparison.Ordinal);
        Assert.Equal("Expected a number; found the string \"thick\".", scanErrors["$.cuts[0].diameterMm"]);

        using var outcome = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/trees/any-tree/outcomes", "controller",
            ServiceUnderTest.Json("""{"version": "1", "cutId": 7, "outcome": "done", "configuration": [0, "a"]}""")));
        var outcomeProblem = await outcome.Content.ReadFromJsonAsync<JsonElement>();
        Assert.Equal(HttpStatusCode.BadRequest, outcome.StatusCode);
        Assert.Equal("application/problem+json", outcome.Content.Headers.ContentType?.MediaType);
        var outcomePaths = outcomeProblem.GetProperty("errors").EnumerateArray().Select(e => e.GetProperty("path").GetString()).Order(StringComparer.Ordinal);
        Assert.Equal(["$.configuration[1]", "$.cutId", "$.version"], outcomePaths);
        Assert.DoesNotContain("System.", outcomeProblem.GetRawText(), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Refused_members_and_wrong_types_are_listed_together()
    {
        var service = await Service.Value;
        using var scan = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet",
            ServiceUnderTest.Json("""{"treeId": 5, "colour": "red", "cuts": [], "Cuts": [{"kind": "lopping"}]}""")));
        Assert.Equal(HttpStatusCode.BadRequest, scan.StatusCode);
        var errors = (await scan.Content.ReadFromJsonAsync<JsonElement>()).GetProperty("errors").EnumerateArray()
            .ToDictionary(e => e.GetProperty("path").GetString()!, e => e.GetProperty("code").GetString()!);
        Assert.Equal("member.unknown", errors["$.colour"]);
        Assert.Equal("member.duplicate", errors["$.Cuts"]);
        Assert.Equal("json.type", errors["$.treeId"]);
        Assert.DoesNotContain("$.Cuts[0].kind", errors.Keys); // nothing is said about what is inside a refused member
    }

    [Fact]
    public async Task Unknown_routes_and_methods_are_problems_too()
    {
        var service = await Service.Value;
        using var missing = await service.Http.SendAsync(service.Request(HttpMethod.Get, "/api/v1/nothing-here", "admin"));
        Assert.Equal(HttpStatusCode.NotFound, missing.StatusCode);
        Assert.Equal("application/problem+json", missing.Content.Headers.ContentType?.MediaType);
        using var wrongMethod = await service.Http.SendAsync(service.Request(HttpMethod.Delete, "/api/v1/scans", "admin"));
        Assert.Equal(HttpStatusCode.MethodNotAllowed, wrongMethod.StatusCode);
        Assert.Equal("application/problem+json", wrongMethod.Content.Headers.ContentType?.MediaType);
    }

    [Fact]
    public async Task Health_answers_without_a_key()
    {
        var service = await Service.Value;
        using var live = await service.Http.GetAsync(new Uri("/health/live", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, live.StatusCode);
        using var ready = await service.Http.GetAsync(new Uri("/health/ready", UriKind.Relative));
        Assert.Equal(HttpStatusCode.OK, ready.StatusCode);
    }
}
