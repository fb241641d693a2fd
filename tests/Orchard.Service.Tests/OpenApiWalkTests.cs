using System.Net;
using System.Net.Http.Headers;
using System.Net.Http.Json;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using Json.Schema;
using Microsoft.OpenApi;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;
using Orchard.Store.Tests;

namespace Orchard.Service.Tests;

/// <summary>
/// Walks the served OpenAPI document against the running server. The document is read with the
/// Microsoft.OpenApi reader (no errors allowed); every (operation, status) it lists must be reached by one of
/// the requests below, every status the requests meet must be listed, and every answer body must validate
/// against the schema listed for its status and content type (JsonSchema.Net, JSON Schema 2020-12, which
/// OpenAPI 3.1 schemas are). Three servers: a seeded one for the ordinary answers, one with a tiny rate limit
/// for 429, and one whose PostgreSQL database is dropped under it for 503.
/// </summary>
public sealed class OpenApiWalkTests(PostgresServer postgres) : IClassFixture<PostgresServer>
{
    private readonly HashSet<(string Method, string Path, int Status)> _reached = [];
    private readonly List<string> _failures = [];
    private OpenApiDocument _document = null!;
    private JsonObject _served = null!;

    [Fact]
    public async Task Every_documented_status_is_reached_and_every_answer_matches_its_schema()
    {
        await using var main = await ServiceUnderTest.StartAsync(maxBodyBytes: 256 * 1024);
        var text = await main.Http.GetStringAsync(new Uri("/openapi/v1.json", UriKind.Relative));
        var read = OpenApiDocument.Parse(text, "json");
        Assert.True(read.Document is not null, "the document does not parse");
        Assert.Empty(read.Diagnostic?.Errors ?? []);
        _document = read.Document;
        _served = JsonNode.Parse(text)!.AsObject();
        Assert.Equal(ApiDocumentationSecurity, _served["components"]!["securitySchemes"]!["apiKey"]!.ToJsonString());
        Assert.DoesNotContain("\"string\",\"number\"", text.Replace(" ", string.Empty, StringComparison.Ordinal), StringComparison.Ordinal);
        Assert.DoesNotContain("\"number\",\"string\"", text.Replace(" ", string.Empty, StringComparison.Ordinal), StringComparison.Ordinal);

        await WalkOrdinaryAnswersAsync(main);
        await WalkRateLimitAsync();
        await WalkStoreOutageAsync();

        var documented = _document.Paths.SelectMany(p => p.Value.Operations!.SelectMany(o => o.Value.Responses!.Keys.Select(s => (o.Key.Method.ToUpperInvariant(), p.Key, int.Parse(s, System.Globalization.CultureInfo.InvariantCulture)))))
            .ToHashSet();
        foreach (var missing in documented.Except(_reached).Order())
        {
            _failures.Add($"documented but not reached: {missing.Item1} {missing.Item2} {missing.Item3}");
        }

        Assert.True(_failures.Count == 0, string.Join("\n", _failures));
    }

    private const string ApiDocumentationSecurity =
        """{"type":"apiKey","description":"An API key made by an admin (POST /api/v1/api-keys); its role (tablet, controller, manager, admin) decides what it may do.","name":"X-Api-Key","in":"header"}""";

    private async Task WalkOrdinaryAnswersAsync(ServiceUnderTest s)
    {
        var orchard = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 2));
        var big = "{\"treeId\": \"" + new string('x', 300 * 1024) + "\"}";

        await CheckAsync(s, "GET", "/health/live", "/health/live", null, null, 200);
        await CheckAsync(s, "GET", "/health/ready", "/health/ready", null, null, 200);

        const string rows = "/api/v1/rows";
        await CheckAsync(s, "PUT", rows, rows, "admin", OrchardJson.Serialize(orchard.Registry()), 200);
        await CheckAsync(s, "PUT", rows, rows, "admin", """{"blocks": "none"}""", 400);
        await CheckAsync(s, "PUT", rows, rows, "admin", big, 413);
        await CheckAsync(s, "PUT", rows, rows, "admin", "blocks=K", 415, contentType: "text/plain");
        await CheckAsync(s, "PUT", rows, rows, "admin", "{}", 422);
        await CheckAsync(s, "PUT", rows, rows, null, "{}", 401);
        await CheckAsync(s, "PUT", rows, rows, "manager", "{}", 403);
        await CheckAsync(s, "GET", rows, rows, "manager", null, 200);
        await CheckAsync(s, "GET", rows, rows, null, null, 401);
        await CheckAsync(s, "GET", rows, rows, "tablet", null, 403);

        const string rates = "/api/v1/rates";
        await CheckAsync(s, "PUT", rates, rates, "manager", """{"handSecondsPerCut": 25}""", 200);
        await CheckAsync(s, "PUT", rates, rates, "manager", """{"handSecondsPerCut": "slow"}""", 400);
        await CheckAsync(s, "PUT", rates, rates, "manager", big, 413);
        await CheckAsync(s, "PUT", rates, rates, "manager", "handSecondsPerCut=25", 415, contentType: "application/x-www-form-urlencoded");
        await CheckAsync(s, "PUT", rates, rates, "manager", """{"platformSpeedKmh": -1}""", 422);
        await CheckAsync(s, "PUT", rates, rates, null, "{}", 401);
        await CheckAsync(s, "PUT", rates, rates, "tablet", "{}", 403);
        await CheckAsync(s, "GET", rates, rates, "manager", null, 200);
        await CheckAsync(s, "GET", rates, rates, null, null, 401);
        await CheckAsync(s, "GET", rates, rates, "controller", null, 403);

        const string scans = "/api/v1/scans";
        var tree = orchard.Trees[0].Scan with { Cuts = orchard.Trees[0].Scan.Cuts.Take(4).ToArray() };
        var accepted = await CheckAsync(s, "POST", scans, scans, "tablet", OrchardJson.Serialize(tree), 202);
        await CheckAsync(s, "POST", scans, scans, "tablet", """{"treeId": 5}""", 400);
        await CheckAsync(s, "POST", scans, scans, "tablet", big, 413);
        await CheckAsync(s, "POST", scans, scans, "tablet", OrchardJson.Serialize(tree), 415, contentType: "text/plain");
        await CheckAsync(s, "POST", scans, scans, "tablet", """{"treeId": "x"}""", 422);
        await CheckAsync(s, "POST", scans, scans, null, "{}", 401);
        await CheckAsync(s, "POST", scans, scans, "manager", "{}", 403);

        var jobId = accepted!.RootElement.GetProperty("jobId").GetString()!;
        Assert.Equal("done", (await s.WaitForJobAsync(jobId, TimeSpan.FromSeconds(90))).GetProperty("status").GetString());
        const string job = "/api/v1/jobs/{jobId}";
        await CheckAsync(s, "GET", job, $"/api/v1/jobs/{jobId}", "tablet", null, 200);
        await CheckAsync(s, "GET", job, "/api/v1/jobs/job-none", "tablet", null, 404);
        await CheckAsync(s, "GET", job, "/api/v1/jobs/job%7C1", "tablet", null, 422);
        await CheckAsync(s, "GET", job, $"/api/v1/jobs/{jobId}", null, null, 401);

        const string trees = "/api/v1/trees";
        await CheckAsync(s, "GET", trees, trees, "manager", null, 200);
        await CheckAsync(s, "GET", trees, trees, null, null, 401);
        await CheckAsync(s, "GET", trees, trees, "tablet", null, 403);

        const string schedule = "/api/v1/trees/{treeId}/schedule";
        var here = $"/api/v1/trees/{tree.TreeId}/schedule";
        var planned = await CheckAsync(s, "GET", schedule, here, "controller", null, 200);
        await CheckAsync(s, "GET", schedule, here, "controller", null, 304, ("If-None-Match", "\"v1\""));
        await CheckAsync(s, "GET", schedule, "/api/v1/trees/T-none/schedule", "controller", null, 404);
        await CheckAsync(s, "GET", schedule, "/api/v1/trees/a%2Fb/schedule", "controller", null, 422);
        await CheckAsync(s, "GET", schedule, here, null, null, 401);
        await CheckAsync(s, "GET", schedule, here, "tablet", null, 403);

        const string scan = "/api/v1/trees/{treeId}/scan";
        await CheckAsync(s, "GET", scan, $"/api/v1/trees/{tree.TreeId}/scan", "manager", null, 200);
        await CheckAsync(s, "GET", scan, "/api/v1/trees/T-none/scan", "manager", null, 404);
        await CheckAsync(s, "GET", scan, "/api/v1/trees/%20T-none/scan", "manager", null, 422);
        await CheckAsync(s, "GET", scan, $"/api/v1/trees/{tree.TreeId}/scan", null, null, 401);
        await CheckAsync(s, "GET", scan, $"/api/v1/trees/{tree.TreeId}/scan", "tablet", null, 403);

        const string outcomes = "/api/v1/trees/{treeId}/outcomes";
        var outcomesHere = $"/api/v1/trees/{tree.TreeId}/outcomes";
        var firstCut = planned!.RootElement.GetProperty("stops")[0].GetProperty("steps")[0].GetProperty("cutId").GetString();
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", JsonSerializer.Serialize(new { version = 9, cutId = firstCut, outcome = "done" }), 409);
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", JsonSerializer.Serialize(new { version = 1, cutId = firstCut, outcome = "done", durationSeconds = 0.8 }), 202);
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", """{"version": "1"}""", 400);
        await CheckAsync(s, "POST", outcomes, "/api/v1/trees/T-none/outcomes", "controller", JsonSerializer.Serialize(new { version = 1, cutId = firstCut, outcome = "done" }), 404);
        // An outcome word that is not one of the enum's is a type error (400), listing the allowed values.
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", JsonSerializer.Serialize(new { version = 1, cutId = firstCut, outcome = "bogus" }), 400);
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", big, 413);
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", JsonSerializer.Serialize(new { version = 1, cutId = firstCut, outcome = "done" }), 415, contentType: "text/plain");
        await CheckAsync(s, "POST", outcomes, outcomesHere, "controller", JsonSerializer.Serialize(new { version = 1, outcome = "done" }), 422);
        await CheckAsync(s, "POST", outcomes, outcomesHere, null, "{}", 401);
        await CheckAsync(s, "POST", outcomes, outcomesHere, "tablet", "{}", 403);

        foreach (var path in new[] { "/api/v1/estimates", "/api/v1/estimates.csv" })
        {
            await CheckAsync(s, "GET", path, path, "manager", null, 200);
            await CheckAsync(s, "GET", path, path + "?platformSpeedKmh=fast", "manager", null, 400);
            await CheckAsync(s, "GET", path, path, null, null, 401);
            await CheckAsync(s, "GET", path, path, "tablet", null, 403);
        }

        const string arm = "/api/v1/arm-profiles/{armId}";
        var armJson = OrchardJson.Serialize(DemoArm.Create());
        await CheckAsync(s, "PUT", arm, $"/api/v1/arm-profiles/{DemoArm.Id}", "admin", armJson, 200);
        await CheckAsync(s, "PUT", arm, "/api/v1/arm-profiles/other", "admin", """{"joints": 3}""", 400);
        await CheckAsync(s, "PUT", arm, "/api/v1/arm-profiles/other", "admin", big, 413);
        await CheckAsync(s, "PUT", arm, "/api/v1/arm-profiles/other", "admin", armJson, 415, contentType: "text/plain");
        await CheckAsync(s, "PUT", arm, "/api/v1/arm-profiles/other", "admin", armJson, 422);
        await CheckAsync(s, "PUT", arm, "/api/v1/arm-profiles/other", null, armJson, 401);
        await CheckAsync(s, "PUT", arm, "/api/v1/arm-profiles/other", "manager", armJson, 403);
        await CheckAsync(s, "GET", arm, $"/api/v1/arm-profiles/{DemoArm.Id}", "admin", null, 200);
        await CheckAsync(s, "GET", arm, "/api/v1/arm-profiles/none", "admin", null, 404);
        await CheckAsync(s, "GET", arm, "/api/v1/arm-profiles/arm%7Cx", "admin", null, 422);
        await CheckAsync(s, "GET", arm, $"/api/v1/arm-profiles/{DemoArm.Id}", null, null, 401);
        await CheckAsync(s, "GET", arm, $"/api/v1/arm-profiles/{DemoArm.Id}", "manager", null, 403);
        await CheckAsync(s, "GET", "/api/v1/arm-profiles", "/api/v1/arm-profiles", "admin", null, 200);
        await CheckAsync(s, "GET", "/api/v1/arm-profiles", "/api/v1/arm-profiles", null, null, 401);
        await CheckAsync(s, "GET", "/api/v1/arm-profiles", "/api/v1/arm-profiles", "manager", null, 403);

        const string keys = "/api/v1/api-keys";
        var made = await CheckAsync(s, "POST", keys, keys, "admin", """{"role": "tablet", "label": "walk"}""", 201);
        await CheckAsync(s, "POST", keys, keys, "admin", """{"role": """, 400);
        await CheckAsync(s, "POST", keys, keys, "admin", "{\"role\": \"tablet\", \"label\": \"" + new string('x', 300 * 1024) + "\"}", 413);
        await CheckAsync(s, "POST", keys, keys, "admin", "role=tablet", 415, contentType: "text/plain");
        await CheckAsync(s, "POST", keys, keys, "admin", """{"role": "chef"}""", 422);
        await CheckAsync(s, "POST", keys, keys, null, "{}", 401);
        await CheckAsync(s, "POST", keys, keys, "manager", "{}", 403);

        var listed = await CheckAsync(s, "GET", keys, keys, "admin", null, 200);
        await CheckAsync(s, "GET", keys, keys, null, null, 401);
        await CheckAsync(s, "GET", keys, keys, "manager", null, 403);

        const string key = "/api/v1/api-keys/{keyId}";
        var onlyAdmin = listed!.RootElement.EnumerateArray().Single(k => k.GetProperty("role").GetString() == "admin").GetProperty("keyId").GetString();
        await CheckAsync(s, "DELETE", key, $"/api/v1/api-keys/{made!.RootElement.GetProperty("keyId").GetString()}", "admin", null, 204);
        await CheckAsync(s, "DELETE", key, $"/api/v1/api-keys/{onlyAdmin}", "admin", null, 409);
        await CheckAsync(s, "DELETE", key, "/api/v1/api-keys/key-none", "admin", null, 404);
        await CheckAsync(s, "DELETE", key, "/api/v1/api-keys/key%2Fnone", "admin", null, 422);
        await CheckAsync(s, "DELETE", key, "/api/v1/api-keys/key-none", null, null, 401);
        await CheckAsync(s, "DELETE", key, "/api/v1/api-keys/key-none", "manager", null, 403);

        const string audit = "/api/v1/audit";
        await CheckAsync(s, "GET", audit, audit + "?limit=5", "admin", null, 200);
        await CheckAsync(s, "GET", audit, audit + "?limit=many", "admin", null, 400);
        await CheckAsync(s, "GET", audit, audit, null, null, 401);
        await CheckAsync(s, "GET", audit, audit, "manager", null, 403);
    }

    /// <summary>
    /// A server allowing 4 requests a minute per key: after 4, every endpoint answers 429 before looking at
    /// anything else. And the queue quota: a key with its quota of open jobs gets 429 for another scan.
    /// </summary>
    private async Task WalkRateLimitAsync()
    {
        await using (var s = await ServiceUnderTest.StartAsync(requestsPerMinute: 4, workers: 0))
        {
            for (var i = 0; i < 4; i++)
            {
                using var prime = await s.Http.SendAsync(s.Request(HttpMethod.Get, "/api/v1/jobs/job-none", "tablet"));
            }

            foreach (var (method, template, path) in Operations())
            {
                await CheckAsync(s, method, template, path, "tablet", method is "GET" or "DELETE" ? null : "{}", 429);
            }
        }

        await using var quota = await ServiceUnderTest.StartAsync(workers: 0, maxOpenJobsPerKey: 1);
        var orchard = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 1));
        await CheckAsync(quota, "POST", "/api/v1/scans", "/api/v1/scans", "tablet", OrchardJson.Serialize(orchard.Trees[0].Scan), 202);
        await CheckAsync(quota, "POST", "/api/v1/scans", "/api/v1/scans", "tablet", OrchardJson.Serialize(orchard.Trees[1].Scan), 429);
    }

    /// <summary>A server on PostgreSQL whose database is dropped after every key has been seen (keys are kept 30 s): every endpoint answers 503.</summary>
    private async Task WalkStoreOutageAsync()
    {
        var connection = await postgres.CreateDatabaseAsync();
        await using var s = await ServiceUnderTest.StartAsync(connection, workers: 0);
        foreach (var role in new[] { "tablet", "controller", "manager", "admin" })
        {
            using var prime = await s.Http.SendAsync(s.Request(HttpMethod.Get, "/api/v1/jobs/job-none", role));
            Assert.Equal(HttpStatusCode.NotFound, prime.StatusCode);
        }

        await postgres.DropDatabaseAsync(connection);
        var orchard = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 1));
        var valid = new Dictionary<string, (string Role, string? Body)>(StringComparer.Ordinal)
        {
            ["POST /api/v1/scans"] = ("tablet", OrchardJson.Serialize(orchard.Trees[0].Scan)),
            ["POST /api/v1/trees/{treeId}/outcomes"] = ("controller", """{"version": 1, "cutId": "c01", "outcome": "done"}"""),
            ["GET /api/v1/jobs/{jobId}"] = ("tablet", null),
            ["GET /api/v1/trees/{treeId}/schedule"] = ("controller", null),
            ["PUT /api/v1/rows"] = ("admin", OrchardJson.Serialize(orchard.Registry())),
            ["PUT /api/v1/rates"] = ("manager", """{"handSecondsPerCut": 30}"""),
            ["PUT /api/v1/arm-profiles/{armId}"] = ("admin", OrchardJson.Serialize(DemoArm.Create())),
            ["POST /api/v1/api-keys"] = ("admin", """{"role": "tablet"}"""),
            ["GET /api/v1/api-keys"] = ("admin", null),
            ["DELETE /api/v1/api-keys/{keyId}"] = ("admin", null),
            ["GET /api/v1/audit"] = ("admin", null),
        };
        foreach (var (method, template, path) in Operations())
        {
            var (role, body) = valid.GetValueOrDefault($"{method} {template}", (method == "GET" && template.Contains("arm-profiles", StringComparison.Ordinal) ? "admin" : "manager", null));
            await CheckAsync(s, method, template, path, role, body, 503);
        }

        await CheckAsync(s, "GET", "/health/ready", "/health/ready", null, null, 503);
    }

    /// <summary>Every documented /api/v1 operation, with a concrete path (ids that need not exist).</summary>
    private List<(string Method, string Template, string Path)> Operations() =>
        _document.Paths.Where(p => p.Key.StartsWith("/api/v1", StringComparison.Ordinal))
            .SelectMany(p => p.Value.Operations!.Keys.Select(m => (m.Method.ToUpperInvariant(), p.Key,
                p.Key.Replace("{jobId}", "job-none", StringComparison.Ordinal).Replace("{treeId}", "T-none", StringComparison.Ordinal).Replace("{armId}", DemoArm.Id, StringComparison.Ordinal).Replace("{keyId}", "key-none", StringComparison.Ordinal))))
            .ToList();

    /// <summary>Sends one request; checks its status, that the document lists it, and its body against the listed schema. Returns the body when it is JSON.</summary>
    private async Task<JsonDocument?> CheckAsync(ServiceUnderTest s, string method, string template, string path, string? role, string? body, int expected,
        (string Name, string Value)? header = null, string contentType = "application/json")
    {
        using var request = s.Request(new HttpMethod(method), path, role, body is null ? null : new StringContent(body, Encoding.UTF8, contentType));
        if (header is { } h)
        {
            request.Headers.TryAddWithoutValidation(h.Name, h.Value);
        }

        using var response = await s.Http.SendAsync(request);
        var status = (int)response.StatusCode;
        var what = $"{method} {path} as {role ?? "nobody"}";
        if (status != expected)
        {
            _failures.Add($"{what}: {status}, expected {expected}: {await response.Content.ReadAsStringAsync()}");
            return null;
        }

        _reached.Add((method, template, status));
        var operation = _served["paths"]?[template]?[method.ToLowerInvariant()];
        var documented = operation?["responses"]?[status.ToString(System.Globalization.CultureInfo.InvariantCulture)];
        if (documented is null)
        {
            _failures.Add($"{what}: {status} is sent but not documented");
            return null;
        }

        var text = await response.Content.ReadAsStringAsync();
        var mediaType = response.Content.Headers.ContentType?.MediaType;
        var content = documented["content"]?.AsObject();
        if (content is null || content.Count == 0)
        {
            if (text.Length > 0)
            {
                _failures.Add($"{what}: a body is sent but none is documented");
            }

            return null;
        }

        if (mediaType is null || content[mediaType]?["schema"] is not { } schemaNode)
        {
            _failures.Add($"{what}: content type {mediaType} is not documented for {status} (documented: {string.Join(", ", content.Select(c => c.Key))})");
            return null;
        }

        var instance = mediaType.EndsWith("json", StringComparison.Ordinal) ? JsonDocument.Parse(text) : JsonDocument.Parse(JsonSerializer.Serialize(text));
        var result = SchemaFor(schemaNode).Evaluate(instance.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
        if (!result.IsValid)
        {
            var errors = (result.Details ?? []).Where(d => d.Errors is { Count: > 0 }).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}")).Take(5);
            _failures.Add($"{what}: the {status} body does not match its schema: {string.Join("; ", errors)}");
        }

        return instance;
    }

    /// <summary>A response schema as a standalone JSON Schema 2020-12 document: the document's component schemas become its $defs.</summary>
    private JsonSchema SchemaFor(JsonNode schema)
    {
        var root = new JsonObject
        {
            ["$schema"] = "https://json-schema.org/draft/2020-12/schema",
            ["$defs"] = _served["components"]!["schemas"]!.DeepClone(),
            ["allOf"] = new JsonArray(schema.DeepClone()),
        };
        var text = root.ToJsonString().Replace("#/components/schemas/", "#/$defs/", StringComparison.Ordinal);
        return JsonSchema.FromText(text);
    }
}
