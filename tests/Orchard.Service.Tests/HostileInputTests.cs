using System.Net;
using System.Text;
using System.Text.Json.Nodes;
using Orchard.Core.Randomness;

namespace Orchard.Service.Tests;

/// <summary>
/// A generator of malformed and hostile requests — broken and deeply nested JSON, huge and non-finite
/// numbers, wrong types anywhere, cycles, 100,000-node scans, odd unicode, oversize bodies, look-alike and
/// unaddressable ids (bidi overrides, zero-width and decomposed characters, padding, '/', '%2F', dots),
/// members repeated in another case, unknown members, invalid UTF-8 inside strings, and random calls to
/// every path of api/openapi.json with random roles and bodies — 10,000 cases a run: no 5xx, every 4xx a
/// problem, every 400/409/415/422 naming the field (a JSON path per error), and the store consistent
/// afterwards (one queued job per accepted scan).
/// </summary>
public sealed class HostileInputTests
{
    private const int Cases = 10_000;

    [Fact]
    [Trait("Category", "Reliability")]
    public async Task Ten_thousand_hostile_requests_get_no_5xx_and_only_problem_4xx()
    {
        await using var service = await ServiceUnderTest.StartAsync(requestsPerMinute: 1_000_000);
        var random = new DeterministicRandom(8080);
        var scan = JsonNode.Parse(DemoScans.Json(0, cuts: 3))!;
        var paths = OpenApiPaths();
        var roles = new[] { "tablet", "controller", "manager", "admin", null, "ok_forged" };
        var failures = new List<string>();
        var accepted = 0;
        var refusedByKind = new int[13];
        for (var i = 0; i < Cases && failures.Count < 10; i++)
        {
            var kind = random.NextInt(13);
            using var request = kind switch
            {
                <= 5 => service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", new StringContent(HostileScan(scan, random), Encoding.UTF8, "application/json")),
                6 => service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", new ByteArrayContent(RandomBytes(random))),
                7 => service.Request(HttpMethod.Post, $"/api/v1/trees/{Uri.EscapeDataString(OddText(random))}/outcomes", "controller", new StringContent(HostileOutcome(random), Encoding.UTF8, "application/json")),
                10 => IdCase(service, scan, random),
                11 => service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", Json(DuplicateMember(scan, random))),
                12 => service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", Json(InvalidUtf8(scan, random))),
                _ => RandomCall(service, paths, roles, random, scan),
            };
            using var response = await service.Http.SendAsync(request);
            var status = (int)response.StatusCode;
            if (status >= 500)
            {
                failures.Add($"case {i} (kind {kind}): {status} {await response.Content.ReadAsStringAsync()}");
            }
            else if (status >= 400 && response.Content.Headers.ContentType?.MediaType != "application/problem+json")
            {
                failures.Add($"case {i} (kind {kind}): {status} without a problem body ({response.Content.Headers.ContentType})");
            }
            else if (status is 400 or 409 or 415 or 422 && !await NamesTheFieldAsync(response))
            {
                failures.Add($"case {i} (kind {kind}): {status} names no field: {await response.Content.ReadAsStringAsync()}");
            }
            else if (kind >= 10 && status is not (400 or 422))
            {
                failures.Add($"case {i} (kind {kind}): a bad id, a repeated member or invalid UTF-8 was answered {status}, not refused");
            }
            else if (status is 400 or 422)
            {
                refusedByKind[kind]++;
            }

            if (status == 202 && kind <= 5)
            {
                accepted++;
            }
        }

        Assert.True(failures.Count == 0, string.Join("\n", failures));
        for (var k = 10; k <= 12; k++)
        {
            Assert.True(refusedByKind[k] > 500, $"kind {k}: only {refusedByKind[k]} refused");
        }

        // Consistent: every stored scan has its job; nothing half-written.
        var rows = await service.Store.CountRowsAsync(CancellationToken.None);
        var scans = rows["scans"];
        var planJobs = rows["jobs"];
        Assert.True(planJobs >= scans, $"{scans} scans but {planJobs} jobs");
        Assert.True(accepted <= scans, $"{accepted} accepted, {scans} stored");
    }

    [Fact]
    public async Task A_hundred_thousand_node_scan_is_refused_as_a_problem()
    {
        await using var service = await ServiceUnderTest.StartAsync();
        var huge = new StringBuilder("{\"treeId\":\"big\",\"nodes\":[");
        for (var n = 0; n < 100_000; n++)
        {
            huge.Append(n == 0 ? string.Empty : ",").Append("{\"id\":\"n").Append(n).Append("\",\"xM\":0,\"yM\":0,\"zM\":").Append(n * 1e-5).Append('}');
        }

        huge.Append("]}");
        using var tooMany = await service.Http.SendAsync(service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", ServiceUnderTest.Json(huge.ToString())));
        Assert.Equal(HttpStatusCode.UnprocessableEntity, tooMany.StatusCode);
        Assert.Contains("nodes.tooMany", await tooMany.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.Equal("application/problem+json", tooMany.Content.Headers.ContentType?.MediaType);
    }

    /// <summary>Every error of the problem names the field it is about by a JSON path.</summary>
    private static async Task<bool> NamesTheFieldAsync(HttpResponseMessage response)
    {
        var problem = JsonNode.Parse(await response.Content.ReadAsStringAsync());
        return problem?["errors"] is JsonArray { Count: > 0 } errors
            && errors.All(e => e?["path"]?.GetValue<string>() is { Length: > 0 } path && path.StartsWith('$'));
    }

    private static readonly string[] BadIds =
    [
        "\u202EK1-001", "K1\u200B001", "K1-cafe\u0301", " K1-001", "K1-001 ", "K1/001", "K1%2F001", ".", "..", "", "K1 001", "\uFF2B1-001", new string('k', 65), "k1\u0000",
    ];

    /// <summary>A scan whose tree id, or one of its node, branch or cut ids, is a look-alike or cannot be addressed; or such an id in an address.</summary>
    private static HttpRequestMessage IdCase(ServiceUnderTest service, JsonNode valid, DeterministicRandom random)
    {
        var bad = BadIds[random.NextInt(BadIds.Length)];
        if (random.NextBool(0.25) && bad.Length > 0 && bad is not ("." or "..") && !bad.Contains('\0', StringComparison.Ordinal))
        {
            return service.Request(HttpMethod.Get, $"/api/v1/trees/{Uri.EscapeDataString(bad)}/schedule", "controller");
        }

        var copy = valid.DeepClone();
        var (collection, member) = new[] { ("", "treeId"), ("nodes", "id"), ("branches", "id"), ("cuts", "id"), ("cuts", "branchId") }[random.NextInt(5)];
        if (collection.Length == 0)
        {
            copy[member] = bad;
        }
        else
        {
            var items = copy[collection]!.AsArray();
            items[random.NextInt(items.Count)]![member] = bad;
        }

        return service.Request(HttpMethod.Post, "/api/v1/scans", "tablet", Json(copy.ToJsonString()));
    }

    /// <summary>A member of some object of the scan written twice, the second time in another case or the same.</summary>
    private static string DuplicateMember(JsonNode valid, DeterministicRandom random)
    {
        var text = valid.ToJsonString();
        var names = new[] { "treeId", "nodes", "xM", "fromNode", "positionAlong", "armBase", "kind", "diameterMm" };
        var name = names[random.NextInt(names.Length)];
        var variant = random.NextInt(3) switch { 0 => name, 1 => name.ToUpperInvariant(), _ => char.ToUpperInvariant(name[0]) + name[1..] };
        var at = text.IndexOf($"\"{name}\":", StringComparison.Ordinal);
        return text[..at] + $"\"{variant}\":null," + text[at..];
    }

    /// <summary>A valid scan with a byte that cannot be UTF-8 (or a cut-off sequence) inside one of its strings.</summary>
    private static byte[] InvalidUtf8(JsonNode valid, DeterministicRandom random)
    {
        var bytes = Encoding.UTF8.GetBytes(valid.ToJsonString());
        var starts = new List<int>();
        for (var i = 1; i < bytes.Length - 2; i++)
        {
            if (bytes[i - 1] == (byte)'"' && bytes[i] is >= (byte)'a' and <= (byte)'z' && bytes[i + 1] is >= (byte)'0' and <= (byte)'z' && bytes[i + 2] != (byte)'"')
            {
                starts.Add(i);
            }
        }

        var at = starts[random.NextInt(starts.Count)];
        bytes[at] = random.NextInt(3) switch { 0 => 0xFF, 1 => 0xC3, _ => 0xED };
        return bytes;
    }

    private static ByteArrayContent Json(byte[] body)
    {
        var content = new ByteArrayContent(body);
        content.Headers.ContentType = new System.Net.Http.Headers.MediaTypeHeaderValue("application/json");
        return content;
    }

    private static StringContent Json(string body) => new(body, Encoding.UTF8, "application/json");

    private static string HostileScan(JsonNode valid, DeterministicRandom random)
    {
        var copy = valid.DeepClone();
        switch (random.NextInt(8))
        {
            case 0:
                return new string('[', random.NextInt(10, 20_000)) + new string(']', random.NextInt(0, 5));
            case 1:
                return "{\"treeId\":\"x\",\"nodes\":[{\"id\":\"n0\",\"xM\":" + (random.NextBool(0.5) ? "1e400" : random.NextBool(0.5) ? "NaN" : "-Infinity") + "}]}";
            case 2:
                return copy.ToJsonString()[..random.NextInt(1, copy.ToJsonString().Length)];
            default:
                for (var k = random.NextInt(1, 4); k > 0; k--)
                {
                    Mutate(copy, random);
                }

                return copy.ToJsonString();
        }
    }

    /// <summary>Replaces a random value somewhere in the document with one of another type, a hostile string or a huge number; or adds a back edge.</summary>
    private static void Mutate(JsonNode root, DeterministicRandom random)
    {
        if (random.NextBool(0.1) && root["branches"] is JsonArray branches && root["nodes"] is JsonArray { Count: > 1 } nodes
            && nodes[^1] is JsonObject last && last["id"] is JsonValue lastId && lastId.TryGetValue<string>(out var from)
            && nodes[1] is JsonObject second && second["id"] is JsonValue secondId && secondId.TryGetValue<string>(out var to))
        {
            branches.Add(new JsonObject { ["id"] = "loop", ["fromNode"] = from, ["toNode"] = to, ["fromRadiusM"] = 0.003, ["toRadiusM"] = 0.003 });
            return;
        }

        var node = root;
        for (var depth = 0; depth < 4; depth++)
        {
            JsonNode? next = node switch
            {
                JsonObject o when o.Count > 0 => o.ElementAt(random.NextInt(o.Count)).Value,
                JsonArray a when a.Count > 0 => a[random.NextInt(a.Count)],
                _ => null,
            };
            if (next is null || random.NextBool(0.25))
            {
                break;
            }

            node = next;
        }

        JsonNode? replacement = random.NextInt(8) switch
        {
            0 => null,
            1 => JsonValue.Create(OddText(random)),
            2 => JsonValue.Create(random.NextBool(0.5) ? 1e308 : -1e308),
            3 => new JsonArray(1, "two", null),
            4 => new JsonObject { ["nested"] = new JsonObject { ["deeper"] = true } },
            5 => JsonValue.Create(random.NextDouble(-1e6, 1e6)),
            6 => JsonValue.Create(true),
            _ => JsonValue.Create(string.Empty),
        };
        switch (node.Parent)
        {
            case JsonObject parent:
                parent[node.GetPropertyName()] = replacement;
                break;
            case JsonArray array:
                array[node.GetElementIndex()] = replacement;
                break;
        }
    }

    private static string HostileOutcome(DeterministicRandom random) => random.NextInt(4) switch
    {
        0 => "{\"version\":\"one\"}",
        1 => "{\"version\":1,\"cutId\":\"" + OddText(random).Replace("\"", string.Empty, StringComparison.Ordinal) + "\",\"outcome\":\"missed\",\"configuration\":[1e308,-1e308]}",
        2 => "{\"version\":-5,\"cutId\":null,\"outcome\":\"done\"}",
        _ => "[" + new string('{', 50),
    };

    private static HttpRequestMessage RandomCall(ServiceUnderTest service, List<(string Method, string Path)> paths, string?[] roles, DeterministicRandom random, JsonNode scan)
    {
        var (method, template) = paths[random.NextInt(paths.Count)];
        var path = System.Text.RegularExpressions.Regex.Replace(template, "\\{[^}]+\\}", _ => Uri.EscapeDataString(random.NextBool(0.5) ? "K1-001" : OddText(random)));
        if (random.NextBool(0.2))
        {
            method = new[] { "GET", "POST", "PUT", "DELETE", "PATCH" }[random.NextInt(5)];
        }

        HttpContent? body = method is "POST" or "PUT" or "PATCH"
            ? new StringContent(random.NextBool(0.5) ? HostileScan(scan, random) : "{\"role\":\"" + OddText(random).Replace("\"", string.Empty, StringComparison.Ordinal) + "\"}", Encoding.UTF8, "application/json")
            : null;
        var key = Uri.EscapeDataString(OddText(random));
        return service.Request(new HttpMethod(method), path, roles[random.NextInt(roles.Length)], body, random.NextBool(0.2) ? key[..Math.Min(10, key.Length)] + random.NextInt(1000) : null);
    }

    private static string OddText(DeterministicRandom random) => random.NextInt(6) switch
    {
        0 => "\u202Eevil\u202C",
        1 => "🍎🌳✂️",
        2 => "tab\tnew\nline",
        3 => new string('ÿ', random.NextInt(1, 300)),
        4 => "a/../../etc/passwd",
        _ => "ok-" + random.NextInt(100),
    };

    private static byte[] RandomBytes(DeterministicRandom random)
    {
        var bytes = new byte[random.NextInt(1, 2000)];
        for (var i = 0; i < bytes.Length; i++)
        {
            bytes[i] = (byte)random.NextInt(256);
        }

        return bytes;
    }

    private static List<(string Method, string Path)> OpenApiPaths()
    {
        var root = new DirectoryInfo(AppContext.BaseDirectory);
        while (root is not null && !File.Exists(Path.Combine(root.FullName, "Orchard.sln")))
        {
            root = root.Parent;
        }

        var document = JsonNode.Parse(File.ReadAllText(Path.Combine(root!.FullName, "api", "openapi.json")))!;
        return document["paths"]!.AsObject().SelectMany(p => p.Value!.AsObject().Select(m => (m.Key.ToUpperInvariant(), p.Key))).ToList();
    }
}
