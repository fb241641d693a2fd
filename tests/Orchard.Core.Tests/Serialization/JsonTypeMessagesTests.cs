using Orchard.Core.Model;
using Orchard.Core.Serialization;

namespace Orchard.Core.Tests.Serialization;

/// <summary>
/// Values of the wrong JSON type are all reported at once, each with its JSON path, the JSON type expected
/// (RFC 8259's names: string, number, object, array, true/false, null) and, for an enum, the values allowed;
/// no message names a .NET type.
/// </summary>
public sealed class JsonTypeMessagesTests
{
    private static readonly string[] ScanPaths =
        ["$.treeId", "$.row", "$.positionInRow", "$.scannedAt", "$.armBase", "$.nodes[0].xM", "$.nodes[0].yM", "$.nodes[1].zM", "$.branches", "$.cuts[0].kind", "$.cuts[1].kind"];

    private static readonly string[] TypeCodes = ["json.type", "json.enum"];

    [Fact]
    public void Every_wrong_type_in_a_scan_is_named_by_path_with_the_type_expected()
    {
        const string json = """
            {
              "treeId": 5,
              "block": "K",
              "row": ["K1"],
              "positionInRow": 1.5,
              "scannedAt": "yesterday",
              "armBase": "beside the tree",
              "nodes": [{ "id": "n0", "xM": "high", "yM": null, "zM": 0 }, { "id": "n1", "xM": 0, "yM": 0, "zM": true }],
              "branches": {},
              "obstacles": [],
              "cuts": [{ "id": "c1", "branchId": "b1", "positionAlong": 0.5, "kind": "lopping", "diameterMm": 12 }, { "kind": 3 }],
              "unknownExtra": { "ignored": true }
            }
            """;

        var parsed = OrchardJson.Parse<TreeScan>(json);

        Assert.False(parsed.Succeeded);
        var byPath = parsed.Problems.ToDictionary(p => p.Path, p => p.Message);
        Assert.Equal(ScanPaths.Order(StringComparer.Ordinal), byPath.Keys.Order(StringComparer.Ordinal));
        Assert.Equal("Expected a string; found the number 5.", byPath["$.treeId"]);
        Assert.Equal("Expected a string; found an array.", byPath["$.row"]);
        Assert.StartsWith("Expected a whole number (integer", byPath["$.positionInRow"], StringComparison.Ordinal);
        Assert.EndsWith("found the number 1.5.", byPath["$.positionInRow"], StringComparison.Ordinal);
        Assert.StartsWith("Expected a date-time string (RFC 3339", byPath["$.scannedAt"], StringComparison.Ordinal);
        Assert.Equal("Expected an object; found the string \"beside the tree\".", byPath["$.armBase"]);
        Assert.Equal("Expected a number; found the string \"high\".", byPath["$.nodes[0].xM"]);
        Assert.Equal("Expected a number; found null.", byPath["$.nodes[0].yM"]);
        Assert.Equal("Expected a number; found true.", byPath["$.nodes[1].zM"]);
        Assert.Equal("Expected an array of an object; found an object.", byPath["$.branches"]);
        Assert.Equal("Expected a string, one of \"thinning\", \"heading\", \"cutBack\", \"renewal\"; found the string \"lopping\".", byPath["$.cuts[0].kind"]);
        Assert.Contains("found the number 3", byPath["$.cuts[1].kind"], StringComparison.Ordinal);
        Assert.All(parsed.Problems, p => Assert.DoesNotContain("System.", p.Message, StringComparison.Ordinal));
        Assert.Contains(parsed.Problems, p => p.Code == "json.enum");
        Assert.All(parsed.Problems, p => Assert.Contains(p.Code, TypeCodes));
    }

    [Fact]
    public void An_arm_profile_lists_the_joint_kinds_allowed()
    {
        const string json = """
            { "id": "a", "joints": [{ "name": "j1", "kind": "spherical", "maxVelocity": "fast", "linkCapsules": [{}, 7] }], "stowConfiguration": [0, "up"] }
            """;

        var parsed = OrchardJson.Parse<ArmProfile>(json);

        var byPath = parsed.Problems.ToDictionary(p => p.Path, p => p.Message);
        Assert.Equal("Expected a string, one of \"revolute\", \"prismatic\"; found the string \"spherical\".", byPath["$.joints[0].kind"]);
        Assert.Equal("Expected a number; found the string \"fast\".", byPath["$.joints[0].maxVelocity"]);
        Assert.Equal("Expected an object; found the number 7.", byPath["$.joints[0].linkCapsules[1]"]);
        Assert.Equal("Expected a number; found the string \"up\".", byPath["$.stowConfiguration[1]"]);
        Assert.Equal(4, parsed.Problems.Count);
    }

    [Fact]
    public void Numbers_beyond_a_double_and_odd_member_names_are_reported_plainly()
    {
        var parsed = OrchardJson.Parse<TreeScan>("""{ "nodes": [{ "xM": 1e400 }], "armBase": { "positionM": { "x": "1" } } }""");

        var byPath = parsed.Problems.ToDictionary(p => p.Path, p => p.Message);
        Assert.Equal("Expected a finite number within the range of a 64-bit float; found the number 1e400.", byPath["$.nodes[0].xM"]);
        Assert.Equal("Expected a number; found the string \"1\".", byPath["$.armBase.positionM.x"]);
    }

    [Fact]
    public void Member_names_are_matched_as_the_reader_matches_them_and_quoted_in_paths_when_needed()
    {
        // The reader ignores case (web defaults), so "TreeID" is the tree id; the path keeps the document's spelling.
        var parsed = OrchardJson.Parse<TreeScan>("""{ "TreeID": 1, "nodes": [{ "x M": "skipped", "ZM": "z" }] }""");

        Assert.Equal(["$.TreeID", "$.nodes[0].ZM"], parsed.Problems.Select(p => p.Path).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void A_flood_of_wrong_types_is_capped_with_a_summary()
    {
        var nodes = string.Join(",", Enumerable.Range(0, 500).Select(i => $"{{\"id\":\"n{i}\",\"xM\":\"a\",\"yM\":\"b\",\"zM\":0}}"));
        var parsed = OrchardJson.Parse<TreeScan>($"{{\"nodes\":[{nodes}]}}");

        Assert.Equal(201, parsed.Problems.Count);
        Assert.Equal("problems.truncated", parsed.Problems[^1].Code);
        Assert.Contains("800 more errors", parsed.Problems[^1].Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Syntax_errors_still_give_one_problem_with_the_line_and_byte()
    {
        var parsed = OrchardJson.Parse<TreeScan>("{\n  \"treeId\": \"a\",\n  \"block\": }");

        var problem = Assert.Single(parsed.Problems);
        Assert.Equal("json.malformed", problem.Code);
        Assert.Contains("(line 3, byte", problem.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_good_document_reads_with_no_problems()
    {
        var parsed = OrchardJson.Parse<TreeScan>(OrchardJson.Serialize(Validation.SampleScans.Valid()));

        Assert.True(parsed.Succeeded);
        Assert.Empty(parsed.Problems);
        Assert.Null(parsed.Problem);
    }
}
