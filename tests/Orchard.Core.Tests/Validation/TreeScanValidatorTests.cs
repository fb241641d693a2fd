using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;

namespace Orchard.Core.Tests.Validation;

public sealed class TreeScanValidatorTests
{
    private static ValidationReport Check(TreeScan scan, ScanLimits? limits = null, double? shear = null) =>
        TreeScanValidator.Validate(scan, limits, shear);

    private static void AssertSingleError(ValidationReport report, string path, string code)
    {
        Assert.False(report.IsValid);
        var error = Assert.Single(report.Errors);
        Assert.Equal(path, error.Path);
        Assert.Equal(code, error.Code);
        Assert.False(string.IsNullOrWhiteSpace(error.Message));
    }

    [Fact]
    public void The_sample_scan_is_valid_with_no_problems()
    {
        var report = Check(SampleScans.Valid(), shear: 25);
        Assert.True(report.IsValid);
        Assert.Empty(report.Problems);
    }

    [Theory]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    [InlineData(double.NegativeInfinity)]
    public void A_non_finite_coordinate_is_named_by_its_path(double bad)
    {
        var report = Check(SampleScans.Valid().WithNode(2, n => n with { YM = bad }));
        AssertSingleError(report, "$.nodes[2].yM", "number.notFinite");
    }

    [Fact]
    public void A_non_finite_radius_and_yaw_are_each_reported()
    {
        var scan = SampleScans.Valid().WithBranch(1, b => b with { ToRadiusM = double.NaN }) with { ArmBase = new ArmBasePose(new Vector3M(0, 1, 0.4), double.NaN) };
        var paths = Check(scan).Errors.Select(e => e.Path).ToList();
        Assert.Equal(["$.armBase.yawRad", "$.branches[1].toRadiusM"], paths.Order(StringComparer.Ordinal));
    }

    [Fact]
    public void A_huge_coordinate_is_out_of_range()
    {
        AssertSingleError(Check(SampleScans.Valid().WithNode(3, n => n with { XM = 1e300 })), "$.nodes[3].xM", "coordinate.outOfRange");
    }

    [Fact]
    public void A_duplicate_node_id_points_at_the_second_use()
    {
        // n3 renamed to n1: the id is duplicated; b2 now ends at the first n1, which already has a parent.
        var report = Check(SampleScans.Valid().WithNode(3, n => n with { Id = "n1" }));
        Assert.Contains(report.Errors, e => e.Path == "$.nodes[3].id" && e.Code == "id.duplicate");
    }

    [Fact]
    public void A_duplicate_branch_id_is_reported()
    {
        var report = Check(SampleScans.Valid().WithBranch(2, b => b with { Id = "b0" }));
        Assert.Contains(report.Errors, e => e.Path == "$.branches[2].id" && e.Code == "id.duplicate");
    }

    [Fact]
    public void A_duplicate_cut_id_is_reported()
    {
        AssertSingleError(Check(SampleScans.Valid().WithCut(1, c => c with { Id = "c1" })), "$.cuts[1].id", "id.duplicate");
    }

    [Fact]
    public void A_duplicate_obstacle_id_is_reported()
    {
        var scan = SampleScans.Valid() with { Obstacles = [.. SampleScans.Valid().Obstacles, SampleScans.Valid().Obstacles[0]] };
        AssertSingleError(Check(scan), "$.obstacles[1].id", "id.duplicate");
    }

    [Fact]
    public void A_branch_to_a_missing_node_is_reported()
    {
        var report = Check(SampleScans.Valid().WithBranch(2, b => b with { ToNode = "n99" }));

        // n3 then hangs loose, which the graph check reports as well.
        Assert.Contains(report.Errors, e => e.Path == "$.branches[2].toNode" && e.Code == "reference.missingNode");
    }

    [Fact]
    public void A_cut_on_a_missing_branch_is_reported()
    {
        AssertSingleError(Check(SampleScans.Valid().WithCut(0, c => c with { BranchId = "b42" })), "$.cuts[0].branchId", "reference.missingBranch");
    }

    [Fact]
    public void A_self_loop_is_a_cycle()
    {
        var report = Check(SampleScans.Valid().WithBranch(2, b => b with { FromNode = "n3", ToNode = "n3" }));
        Assert.Contains(report.Errors, e => e.Path == "$.branches[2].toNode" && e.Code == "graph.selfLoop");
    }

    [Fact]
    public void A_branch_back_to_an_ancestor_gives_a_node_two_parents()
    {
        var scan = SampleScans.Valid() with { Branches = [.. SampleScans.Valid().Branches, new Branch("b3", "n3", "n1", 0.003, 0.003)] };
        AssertSingleError(Check(scan), "$.branches[3].toNode", "graph.twoParents");
    }

    [Fact]
    public void A_loop_cut_off_from_the_trunk_is_reported_as_a_cycle()
    {
        // n4 → n5 → n4 hangs in the air: each node has one parent, yet the trunk base reaches neither.
        var baseScan = SampleScans.Valid();
        var scan = baseScan with
        {
            Nodes = [.. baseScan.Nodes, new ScanNode("n4", 0.2, 0.1, 1.5), new ScanNode("n5", 0.3, 0.1, 1.6)],
            Branches = [.. baseScan.Branches, new Branch("b3", "n4", "n5", 0.003, 0.003), new Branch("b4", "n5", "n4", 0.003, 0.003)],
        };
        var errors = Check(scan).Errors;
        Assert.Equal(2, errors.Count);
        Assert.All(errors, e => Assert.Equal("graph.cycle", e.Code));
        Assert.Equal(["$.branches[3]", "$.branches[4]"], errors.Select(e => e.Path).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Two_separate_trees_have_several_roots()
    {
        var baseScan = SampleScans.Valid();
        var scan = baseScan with
        {
            Nodes = [.. baseScan.Nodes, new ScanNode("m0", 0.5, 0, 0.5), new ScanNode("m1", 0.5, 0, 0.9)],
            Branches = [.. baseScan.Branches, new Branch("d0", "m0", "m1", 0.01, 0.008)],
        };
        AssertSingleError(Check(scan), "$.nodes[4]", "graph.severalRoots");
    }

    [Fact]
    public void A_node_on_no_branch_is_disconnected()
    {
        var baseScan = SampleScans.Valid();
        var scan = baseScan with { Nodes = [.. baseScan.Nodes, new ScanNode("lonely", 0.1, 0.1, 1.0)] };
        AssertSingleError(Check(scan), "$.nodes[4]", "graph.isolatedNode");
    }

    [Fact]
    public void Every_node_having_a_parent_means_there_is_no_root()
    {
        var scan = SampleScans.Valid() with { Branches = [.. SampleScans.Valid().Branches, new Branch("b3", "n2", "n0", 0.01, 0.01)] };
        var report = Check(scan);
        Assert.Contains(report.Errors, e => e.Path == "$.branches" && e.Code == "graph.noRoot");
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-0.01)]
    public void A_radius_that_is_not_positive_is_reported(double radius)
    {
        AssertSingleError(Check(SampleScans.Valid().WithBranch(0, b => b with { FromRadiusM = radius })), "$.branches[0].fromRadiusM", "radius.notPositive");
    }

    [Fact]
    public void An_obstacle_radius_that_is_not_positive_is_reported()
    {
        AssertSingleError(Check(SampleScans.Valid().WithObstacle(0, o => o with { RadiusM = 0 })), "$.obstacles[0].radiusM", "radius.notPositive");
    }

    [Theory]
    [InlineData(-0.001)]
    [InlineData(1.001)]
    [InlineData(double.NaN)]
    public void A_cut_position_outside_zero_to_one_is_reported(double position)
    {
        var code = double.IsNaN(position) ? "number.notFinite" : "cut.positionOutOfRange";
        AssertSingleError(Check(SampleScans.Valid().WithCut(1, c => c with { PositionAlong = position })), "$.cuts[1].positionAlong", code);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-3.0)]
    public void A_cut_diameter_that_is_not_positive_is_reported(double diameter)
    {
        AssertSingleError(Check(SampleScans.Valid().WithCut(0, c => c with { DiameterMm = diameter })), "$.cuts[0].diameterMm", "diameter.notPositive");
    }

    [Fact]
    public void An_unknown_cut_kind_number_is_reported()
    {
        AssertSingleError(Check(SampleScans.Valid().WithCut(0, c => c with { Kind = (CutKind)7 })), "$.cuts[0].kind", "enum.unknown");
    }

    [Fact]
    public void Too_many_cuts_is_an_error_at_the_stated_limit()
    {
        var baseScan = SampleScans.Valid();
        var cuts = Enumerable.Range(0, ScanLimits.Default.MaxCuts + 1).Select(i => new Cut($"c{i}", "b1", 0.5, CutKind.Heading, 20)).ToArray();
        var report = Check(baseScan with { Cuts = cuts });
        AssertSingleError(report, "$.cuts", "cuts.tooMany");
        Assert.Equal(500, ScanLimits.Default.MaxCuts);
    }

    [Fact]
    public void Too_many_nodes_and_branches_are_errors()
    {
        var limits = new ScanLimits { MaxNodes = 3, MaxBranches = 2 };
        var paths = Check(SampleScans.Valid(), limits).Errors.Select(e => e.Path).ToList();
        Assert.Contains("$.nodes", paths);
        Assert.Contains("$.branches", paths);
    }

    [Fact]
    public void An_id_that_is_blank_or_too_long_is_reported()
    {
        var report = Check(SampleScans.Valid() with { TreeId = " ", Row = new string('r', 65) });
        Assert.Equal(["$.row", "$.treeId"], report.Errors.Select(e => e.Path).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void A_short_tree_is_a_warning_not_an_error()
    {
        var scan = SampleScans.Valid().WithNode(2, n => n with { ZM = 1.3 });
        var report = Check(scan);
        Assert.True(report.IsValid);
        var warning = Assert.Single(report.Warnings);
        Assert.Equal(("$.nodes", "tree.heightUnusual", ProblemSeverity.Warning), (warning.Path, warning.Code, warning.Severity));
    }

    [Fact]
    public void A_tall_tree_is_a_warning()
    {
        var report = Check(SampleScans.Valid().WithNode(2, n => n with { ZM = 4.8 }));
        Assert.True(report.IsValid);
        Assert.Contains(report.Warnings, w => w.Code == "tree.heightUnusual");
    }

    [Fact]
    public void A_cut_above_the_shear_rating_is_a_warning_only_when_a_rating_is_given()
    {
        Assert.Empty(Check(SampleScans.Valid()).Problems);
        var report = Check(SampleScans.Valid(), shear: 15);
        Assert.True(report.IsValid);
        var warning = Assert.Single(report.Warnings);
        Assert.Equal(("$.cuts[1].diameterMm", "cut.aboveShearRating"), (warning.Path, warning.Code));
    }

    [Fact]
    public void More_than_sixty_cuts_is_a_warning()
    {
        var cuts = Enumerable.Range(0, 61).Select(i => new Cut($"c{i}", "b1", i / 100.0, CutKind.Heading, 20 - (i * 0.15))).ToArray();
        var report = Check(SampleScans.Valid() with { Cuts = cuts });
        Assert.True(report.IsValid);
        Assert.Contains(report.Warnings, w => w.Path == "$.cuts" && w.Code == "cuts.manyForOneTree");
    }

    [Fact]
    public void Missing_fields_from_json_are_each_named()
    {
        var parsed = OrchardJson.Parse<TreeScan>("""{"treeId":"x","nodes":[{"id":"n0","xM":0,"yM":0,"zM":0}, null]}""");
        Assert.True(parsed.Succeeded);
        var paths = TreeScanValidator.Validate(parsed.Value).Errors.Select(e => e.Path).ToHashSet();
        foreach (var expected in new[] { "$.block", "$.row", "$.scannedAt", "$.armBase", "$.nodes[1]", "$.branches", "$.obstacles", "$.cuts" })
        {
            Assert.Contains(expected, paths);
        }
    }

    [Theory]
    [InlineData("""{"treeId": 5}""", "$.treeId")]
    [InlineData("""{"nodes": [{"id": "n0", "xM": "high"}]}""", "$.nodes[0].xM")]
    [InlineData("""{"cuts": [{"kind": "lopping"}]}""", "$.cuts[0].kind")]
    [InlineData("""{"treeId": "a",""", "$")]
    public void Unreadable_json_names_where_reading_stopped(string json, string path)
    {
        var parsed = OrchardJson.Parse<TreeScan>(json);
        Assert.False(parsed.Succeeded);
        Assert.Equal(path, parsed.Problem!.Path);
        Assert.Equal(ProblemSeverity.Error, parsed.Problem.Severity);
    }

    [Fact]
    public void Deep_nesting_is_refused_without_a_crash()
    {
        var json = "{\"treeId\":" + new string('[', 5000) + new string(']', 5000) + "}";
        var parsed = OrchardJson.Parse<TreeScan>(json);
        Assert.False(parsed.Succeeded);
    }

    [Fact]
    public void A_json_null_document_is_a_problem_not_a_crash()
    {
        var parsed = OrchardJson.Parse<TreeScan>("null");
        Assert.False(parsed.Succeeded);
        Assert.Equal("$", parsed.Problem!.Path);
        Assert.False(TreeScanValidator.Validate(null).IsValid);
    }

    [Fact]
    public void A_flood_of_faults_is_reported_in_bounded_form()
    {
        var nodes = Enumerable.Range(0, 5000).Select(i => new ScanNode("same", double.NaN, 0, 0)).ToArray();
        var report = Check(SampleScans.Valid() with { Nodes = nodes });
        Assert.True(report.Problems.Count <= ProblemCollector.MaxReported + 2);
        Assert.Contains(report.Errors, e => e.Code == "problems.truncated");
    }
}
