using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Randomness;
using Orchard.Core.Reachability;
using Orchard.Core.Tests.Collision;

namespace Orchard.Core.Tests.Reachability;

/// <summary>
/// The analyzer places the shear where the kind says: on a demo tree, renewal cuts and cut backs get
/// candidates whose tool centre point (by the test's own forward kinematics) lies at the place worked out
/// from the wood, not at the scan's positionAlong (left at 0 here).
/// </summary>
public sealed class CutKindReachabilityTests
{
    private const double PositionToleranceM = 1e-4; // The analyzer's IK tolerance, 0.1 mm.

    [Fact]
    public void Renewal_cuts_are_planned_at_the_stub_length_out_from_the_parent()
    {
        var scan = CollisionTestCells.Cell(CollisionTestCells.TreeWithPost).Scan;
        var checkedCuts = 0;
        foreach (var thinning in scan.Cuts.Where(c => c.Kind == CutKind.Thinning))
        {
            var branch = scan.Branches.Single(b => b.Id == thinning.BranchId);
            var parentRadiusM = scan.Branches.Single(b => b.ToNode == branch.FromNode).ToRadiusM;
            var renewal = thinning with { Kind = CutKind.Renewal, PositionAlong = 0, StubLengthM = 0.02 };
            var expected = PointAlong(scan, branch, parentRadiusM + 0.02);
            checkedCuts += CheckCandidates(scan, renewal, expected);
        }

        Assert.True(checkedCuts > 0, "no renewal cut on the demo tree had a candidate to check");
    }

    [Fact]
    public void Cut_backs_are_planned_just_beyond_the_side_branch()
    {
        var scan = CollisionTestCells.Cell(CollisionTestCells.TreeWithPost).Scan;
        var rating = CollisionTestCells.Profile.Tool.MaxCutDiameterMm;
        var checkedCuts = 0;
        var tried = 0;

        // Junctions where a thinner side branch grows beside a branch the shear can cut: cut that branch back to
        // the side branch (the first 24 such junctions).
        foreach (var branch in scan.Branches)
        {
            var side = scan.Branches.FirstOrDefault(s => s.FromNode == branch.FromNode && s.Id != branch.Id && s.FromRadiusM < branch.FromRadiusM);
            if (side is null || 2000 * branch.FromRadiusM > rating || tried++ >= 24)
            {
                continue;
            }

            // Where the side branch's surface crosses this branch's axis (r / sin θ), then the 30 mm clearance.
            var u = Direction(scan, branch);
            var sinAngle = Math.Max(Vec3.Cross(u, Direction(scan, side)).Length, Math.Sin(Math.PI / 12));
            var distanceM = (side.FromRadiusM / sinAngle) + 0.03;
            var cut = new Cut("back", branch.Id, 0, CutKind.CutBack, 2000 * branch.FromRadiusM, BackToBranchId: side.Id);
            checkedCuts += CheckCandidates(scan, cut, PointAlong(scan, branch, distanceM));
        }

        Assert.True(checkedCuts > 0, $"no cut back on the demo tree had a candidate to check ({tried} tried)");
    }

    /// <summary>1 when the cut had candidates (all checked at <paramref name="expected"/>), 0 when it had none.</summary>
    private static int CheckCandidates(TreeScan scan, Cut cut, Vec3 expected)
    {
        var alone = scan with { Cuts = [cut] };
        var cell = new WorkCell(alone, CollisionTestCells.Profile);
        var ik = new InverseKinematics(cell.Chain, ReachabilitySettings.Default.InverseKinematics);
        var result = ReachabilityAnalyzer.AnalyzeCut(cell, cell.CreateChecker(), ik, ReachabilitySettings.Default, 0, DeterministicRandom.ForStream(7, 0));
        var brute = new BruteForceArm(cell.Profile, alone.ArmBase);
        foreach (var candidate in result.Candidates)
        {
            var tcp = brute.ToolPose(candidate.CutConfiguration.ToArray()).Translation;
            Assert.True(Vec3.Distance(tcp, expected) <= PositionToleranceM + 1e-9, $"{cut.Kind} on {cut.BranchId}: TCP {Vec3.Distance(tcp, expected) * 1000:F2} mm from the place");
        }

        return result.Candidates.Count > 0 ? 1 : 0;
    }

    private static Vec3 Direction(TreeScan scan, Branch branch)
    {
        var from = scan.Nodes.Single(n => n.Id == branch.FromNode);
        var to = scan.Nodes.Single(n => n.Id == branch.ToNode);
        return new Vec3(to.XM - from.XM, to.YM - from.YM, to.ZM - from.ZM).Normalized();
    }

    private static Vec3 PointAlong(TreeScan scan, Branch branch, double distanceM)
    {
        var from = scan.Nodes.Single(n => n.Id == branch.FromNode);
        var to = scan.Nodes.Single(n => n.Id == branch.ToNode);
        var a = new Vec3(from.XM, from.YM, from.ZM);
        var b = new Vec3(to.XM, to.YM, to.ZM);
        return a + ((b - a) * (distanceM / Vec3.Distance(a, b)));
    }
}
