using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Reachability;
using Orchard.Core.Tests.Validation;

namespace Orchard.Core.Tests.Reachability;

/// <summary>
/// Where each cut kind sits, on the hand-made sample scan (<see cref="SampleScans.Valid"/>): leader b0 from
/// n0 (0, 0, 0) to n1 (0, 0, 1.0), ending at radius 15 mm; leader b1 on from n1 to n2 (0, 0, 2.2); lateral b2 from
/// n1 to n3 (0.4, 0, 1.1), 6 mm radius at its base. Expected values are worked by hand in the comments.
/// </summary>
public sealed class CutPlacementTests
{
    private const double Tolerance = 1e-12;

    [Theory]
    [InlineData(CutKind.Thinning)]
    [InlineData(CutKind.Heading)]
    public void Thinning_and_heading_cuts_sit_where_the_scan_marks_them(CutKind kind)
    {
        var scan = SampleScans.Valid();
        var cut = new Cut("c", "b1", 0.37, kind, 20);

        var location = CutPlacement.Locate(scan, cut)!.Value;

        Assert.Equal(0.37, location.PositionAlong);
        Assert.Equal(0.37 * 1.2, location.DistanceFromParentEndM, Tolerance);
        Assert.Equal(1.2, location.BranchLengthM, Tolerance);
        Assert.Equal(0.37, CutPlacement.PositionAlong(scan, cut));
    }

    [Fact]
    public void A_renewal_cut_sits_its_stub_length_out_from_the_parents_surface()
    {
        var scan = SampleScans.Valid();
        var cut = new Cut("c", "b2", 0, CutKind.Renewal, 11.5, StubLengthM: 0.02);

        var location = CutPlacement.Locate(scan, cut)!.Value;

        // The parent at n1 is b0, ending at radius 0.015 m: 0.015 + 0.020 = 0.035 m out along b2, whose length is
        // √(0.4² + 0.1²) = 0.4123106 m, so 0.035 / 0.4123106 = 0.0848875 of the way along.
        Assert.Equal(0.035, location.DistanceFromParentEndM, Tolerance);
        Assert.Equal(0.4123106, location.BranchLengthM, 1e-7);
        Assert.Equal(0.0848875, location.PositionAlong, 1e-7);
        Assert.True(location.FitsOnBranch);

        // The shear closes on b2 there: n1 + 0.035 · (0.4, 0, 0.1) / 0.4123106 = (0.0339550, 0, 1.0084887).
        var (point, axis) = ReachabilityAnalyzer.CutPointAndAxis(scan, 2, CutPlacement.PositionAlong(scan, cut));
        Assert.Equal(0.0339550, point.X, 1e-7);
        Assert.Equal(0.0, point.Y, Tolerance);
        Assert.Equal(1.0084887, point.Z, 1e-7);
        Assert.Equal(0.9701425, axis.X, 1e-7);
    }

    [Fact]
    public void A_renewal_cut_on_a_branch_from_the_root_measures_the_stub_from_the_root_node()
    {
        var scan = SampleScans.Valid();
        var cut = new Cut("c", "b0", 0, CutKind.Renewal, 40, StubLengthM: 0.1);

        // Nothing ends at n0, so the parent's radius is 0: 0.1 m along the 1.0 m branch.
        Assert.Equal(0.1, CutPlacement.PositionAlong(scan, cut), Tolerance);
    }

    [Fact]
    public void A_cut_back_sits_on_the_shortened_branch_just_beyond_the_side_branch_it_is_cut_back_to()
    {
        var scan = SampleScans.Valid();
        var cut = new Cut("c", "b1", 0, CutKind.CutBack, 29.8, BackToBranchId: "b2");

        var location = CutPlacement.Locate(scan, cut)!.Value;

        // b1 points up (0, 0, 1); b2 along (0.4, 0, 0.1) / 0.4123106, so cos θ = 0.1 / 0.4123106 = 0.2425356 and
        // sin θ = 0.9701425. b2's surface (radius 0.006 m) crosses b1's axis 0.006 / 0.9701425 = 0.0061847 m up;
        // with the 0.03 m clearance the cut is 0.0361847 m up b1 (1.2 m long): 0.0301539 along, at (0, 0, 1.0361847).
        Assert.Equal(0.03, CutPlacement.CutBackClearanceM);
        Assert.Equal(0.0361847, location.DistanceFromParentEndM, 1e-7);
        Assert.Equal(0.0301539, location.PositionAlong, 1e-7);
        var (point, axis) = ReachabilityAnalyzer.CutPointAndAxis(scan, 1, CutPlacement.PositionAlong(scan, cut));
        Assert.Equal(0, point.X, Tolerance);
        Assert.Equal(1.0361847, point.Z, 1e-7);
        Assert.Equal(Vec3.UnitZ, axis);
    }

    [Fact]
    public void Kinds_whose_references_do_not_resolve_have_no_place()
    {
        var scan = SampleScans.Valid();
        Assert.Null(CutPlacement.Locate(scan, new Cut("c", "b1", 0, CutKind.Renewal, 20)));
        Assert.Null(CutPlacement.Locate(scan, new Cut("c", "b1", 0, CutKind.CutBack, 20)));
        Assert.Null(CutPlacement.Locate(scan, new Cut("c", "b1", 0, CutKind.CutBack, 20, BackToBranchId: "b1")));
        Assert.Null(CutPlacement.Locate(scan, new Cut("c", "b1", 0, CutKind.CutBack, 20, BackToBranchId: "b0")));
        Assert.Null(CutPlacement.Locate(scan, new Cut("c", "nope", 0.5, CutKind.Thinning, 20)));
    }

    [Fact]
    public void A_side_branch_lying_nearly_along_the_limb_counts_as_15_degrees_off_it()
    {
        // A side branch from n1 to (0.01, 0, 2.0): 0.57° off b1, so 15° is used: 0.006 / sin 15° = 0.0231822 m, + 0.03.
        var scan = SampleScans.Valid() with
        {
            Nodes = [.. SampleScans.Valid().Nodes, new ScanNode("n4", 0.01, 0, 2.0)],
            Branches = [.. SampleScans.Valid().Branches, new Branch("b3", "n1", "n4", 0.006, 0.003)],
        };
        var location = CutPlacement.Locate(scan, new Cut("c", "b1", 0, CutKind.CutBack, 29, BackToBranchId: "b3"))!.Value;
        Assert.Equal(0.0531822, location.DistanceFromParentEndM, 1e-7);
        Assert.Throws<ArgumentException>(() => CutPlacement.PositionAlong(scan, new Cut("c", "b1", 0, CutKind.Renewal, 20)));
    }

    [Fact]
    public void A_stub_longer_than_the_branch_does_not_fit()
    {
        var scan = SampleScans.Valid();
        var location = CutPlacement.Locate(scan, new Cut("c", "b2", 0, CutKind.Renewal, 11.5, StubLengthM: 0.5))!.Value;

        // 0.015 + 0.5 = 0.515 m on a 0.412 m branch.
        Assert.False(location.FitsOnBranch);
        Assert.Equal(1.0, CutPlacement.PositionAlong(scan, new Cut("c", "b2", 0, CutKind.Renewal, 11.5, StubLengthM: 0.5)));
    }
}
