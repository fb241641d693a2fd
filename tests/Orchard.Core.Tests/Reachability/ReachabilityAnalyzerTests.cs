using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Randomness;
using Orchard.Core.Reachability;
using Orchard.Core.Serialization;
using Orchard.Core.Tests.Collision;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Reachability;

public sealed class ReachabilityAnalyzerTests(ITestOutputHelper output)
{
    private const ulong Seed = 20260112;

    /// <summary>The inverse-kinematics tolerances the analyzer's defaults use (0.1 mm, 1 mrad).</summary>
    private const double PositionToleranceM = 1e-4;
    private const double AngleToleranceRad = 1e-3;

    private static readonly ReachabilitySettings Settings = ReachabilitySettings.Default;

    private static readonly Dictionary<int, Lazy<IReadOnlyList<CutReachability>>> Analysed = new[] { CollisionTestCells.TreeWithPost, CollisionTestCells.TreeOtherBlock }
        .ToDictionary(t => t, t => new Lazy<IReadOnlyList<CutReachability>>(() => ReachabilityAnalyzer.Analyze(CollisionTestCells.Cell(t), Settings, Seed, CancellationToken.None)));

    [Theory]
    [InlineData(CollisionTestCells.TreeWithPost)]
    [InlineData(CollisionTestCells.TreeOtherBlock)]
    public void Every_candidate_holds_the_shear_square_on_the_branch_at_the_cut_and_comes_in_straight(int tree)
    {
        var cell = CollisionTestCells.Cell(tree);
        var scan = cell.Scan;
        var brute = new BruteForceArm(cell.Profile, scan.ArmBase);
        var standOff = cell.Profile.ApproachStandOffM;
        var candidates = 0;
        foreach (var result in Analysed[tree].Value)
        {
            var cut = scan.Cuts[result.CutIndex];
            var (point, axis) = CutPointAndAxis(scan, cut);
            var facing = CutPoses.FacingApproach(point, axis, cell.BasePositionM);

            // The facing direction is as documented: a unit vector across the branch, from the arm's side (or from above).
            Assert.Equal(1, facing.Length, 1e-12);
            Assert.True(Math.Abs(Vec3.Dot(facing, axis)) <= 1e-12);
            var towardsArm = new Vec3(cell.BasePositionM.X - point.X, cell.BasePositionM.Y - point.Y, 0);
            Assert.True(Vec3.Dot(facing, towardsArm) <= 1e-12 || facing.Z < 0, $"cut {cut.Id}: the approach comes from behind the tree");

            foreach (var candidate in result.Candidates)
            {
                candidates++;
                var what = $"{scan.TreeId} cut {cut.Id} candidate {candidate.CandidateIndex}";
                Assert.True(cell.Chain.WithinLimits(candidate.CutConfiguration.ToArray()), what);
                Assert.True(cell.Chain.WithinLimits(candidate.PreCutConfiguration.ToArray()), what);

                // At the cut: the TCP on the branch axis at the cut point, jaws across the branch (tool y along it, the
                // sign given by JawsFlipped), the approach (tool z) square to it.
                var atCut = brute.ToolPose(candidate.CutConfiguration.ToArray());
                Assert.True(Vec3.Distance(atCut.Translation, point) <= PositionToleranceM + 1e-9, $"{what}: TCP {Vec3.Distance(atCut.Translation, point) * 1000:F3} mm from the cut point");
                var y = atCut.Rotation.ColumnY;
                var z = atCut.Rotation.ColumnZ;
                Assert.True(Angle(y, candidate.JawsFlipped ? -axis : axis) <= AngleToleranceRad + 1e-9, $"{what}: tool y {Angle(y, axis):E2} rad off the branch");
                Assert.True(Math.Abs(Vec3.Dot(z, axis)) <= Math.Sin(AngleToleranceRad) + 1e-9, $"{what}: approach not square to the branch");

                // The approach angle lies in the cone and is the turn of tool z about the branch from the facing direction.
                Assert.InRange(Math.Abs(candidate.ApproachAngleRad), 0, Settings.ApproachConeHalfAngleRad + 1e-12);
                var approach = Rot3.AxisAngle(axis, candidate.ApproachAngleRad) * facing;
                Assert.True(Angle(z, approach) <= AngleToleranceRad + 1e-9, $"{what}: tool z {Angle(z, approach):E2} rad from the stated approach");

                // Pre-cut: the same shear pose backed off by the stand-off along −z.
                var preCut = brute.ToolPose(candidate.PreCutConfiguration.ToArray());
                var expectedPreCut = point - (approach * standOff);
                Assert.True(Vec3.Distance(preCut.Translation, expectedPreCut) <= PositionToleranceM + 1e-9, $"{what}: pre-cut TCP {Vec3.Distance(preCut.Translation, expectedPreCut) * 1000:F3} mm off");
                Assert.True(Angle(preCut.Rotation.ColumnZ, approach) <= AngleToleranceRad + 1e-9, what);
                Assert.True(Angle(preCut.Rotation.ColumnY, atCut.Rotation.ColumnY) <= (2 * AngleToleranceRad) + 1e-9, what);

                // The path runs from the clear pose through the pre-cut pose to the cut, every pose on the approach
                // line at its station (distance from the clear pose), moving in steadily; the stand-off in the
                // configured steps, the retreat beyond it at most the configured distance.
                var path = candidate.ApproachPath;
                var stations = candidate.ApproachStationsM;
                Assert.Equal(path.Count, stations.Count);
                Assert.Equal(candidate.ClearConfiguration, path[0]);
                Assert.Equal(candidate.PreCutConfiguration, path[candidate.PreCutIndex]);
                Assert.Equal(candidate.CutConfiguration, path[^1]);
                Assert.Equal(Settings.ApproachSteps, path.Count - 1 - candidate.PreCutIndex);
                Assert.Equal(0, stations[0]);
                Assert.Equal(standOff, stations[^1] - stations[candidate.PreCutIndex], 12);
                Assert.InRange(stations[^1], standOff - 1e-12, standOff + Settings.MaxRetreatM + 1e-12);
                for (var i = 0; i < path.Count; i++)
                {
                    var tcp = brute.ToolPose(path[i]).Translation;
                    var back = stations[^1] - stations[i];
                    Assert.True(i == 0 || stations[i] > stations[i - 1], $"{what}: stations not increasing");
                    Assert.True(Vec3.Distance(tcp, point - (approach * back)) <= PositionToleranceM + 1e-9, $"{what}: path pose {i} off the approach line");
                    Assert.True(cell.Chain.WithinLimits(path[i]), what);
                }
            }
        }

        output.WriteLine($"{scan.TreeId}: {candidates} candidates for {scan.Cuts.Count} cuts");
        Assert.True(candidates >= 20, "too few candidates to show anything");
    }

    [Theory]
    [InlineData(CollisionTestCells.TreeWithPost)]
    [InlineData(CollisionTestCells.TreeOtherBlock)]
    public void Every_candidate_passes_the_collision_checks_and_cuts_are_reported_as_documented(int tree)
    {
        var cell = CollisionTestCells.Cell(tree);
        var scan = cell.Scan;
        var checker = cell.CreateChecker();
        var results = Analysed[tree].Value;
        Assert.Equal(scan.Cuts.Count, results.Count);
        int candidates = 0, shearOnWood = 0, edges = 0, clearEnough = 0, stoppedShort = 0, ranToEnd = 0;
        for (var c = 0; c < results.Count; c++)
        {
            var result = results[c];
            var cut = scan.Cuts[c];
            var branch = scan.Branches.ToList().FindIndex(b => b.Id == cut.BranchId);
            Assert.Equal(c, result.CutIndex);
            Assert.Equal(cut.Id, result.CutId);
            Assert.Equal(cell.Scene.LimbOfBranch[branch], result.LimbGroup);
            Assert.Equal(result.Candidates.Count > 0, result.IsReachable);
            Assert.Equal(result.IsReachable, result.Reason is null);
            Assert.Equal(result.IsReachable, result.Detail is null);

            // At most the configured number, the clearest first, numbered in that order.
            Assert.InRange(result.Candidates.Count, 0, Settings.MaxCandidatesPerCut);
            for (var k = 0; k < result.Candidates.Count; k++)
            {
                Assert.Equal(k, result.Candidates[k].CandidateIndex);
                Assert.Equal(c, result.Candidates[k].CutIndex);
                if (k > 0)
                {
                    Assert.True(result.Candidates[k - 1].ClearanceM >= result.Candidates[k].ClearanceM);
                }
            }

            foreach (var candidate in result.Candidates)
            {
                candidates++;
                var what = $"{scan.TreeId} cut {cut.Id} candidate {candidate.CandidateIndex}";
                var preCut = candidate.PreCutConfiguration.ToArray();
                var atCut = candidate.CutConfiguration.ToArray();

                // Clear and pre-cut poses: free of everything, the cut limb included; the clear pose's clearance is
                // the candidate's, and it has the room asked for unless the retreat ran to its end.
                var clear = candidate.ClearConfiguration.ToArray();
                Assert.True(checker.IsFree(preCut), $"{what}: pre-cut not free");
                Assert.True(checker.IsFree(clear), $"{what}: clear pose not free");
                Assert.Equal(checker.SceneClearanceM(clear), candidate.ClearanceM);
                if (candidate.ClearanceM >= Settings.ClearanceTargetM)
                {
                    clearEnough++;
                }
                else if (candidate.ApproachDistanceM < cell.Profile.ApproachStandOffM + Settings.MaxRetreatM - 1e-9)
                {
                    // Short of room and of the longest retreat: one more step out along the approach must be impossible.
                    Assert.False(OneMoreStepOut(cell, checker, candidate), $"{what}: the retreat stopped at {candidate.ClearanceM * 1000:F1} mm of room though one more step out was possible");
                    stoppedShort++;
                }
                else
                {
                    ranToEnd++;
                }

                // Out beyond the pre-cut pose nothing may be touched; at the cut and on the final approach only the
                // tool may touch the cut's limb.
                Assert.True(checker.IsFree(atCut, result.LimbGroup), $"{what}: cut configuration not free with its limb ignored");
                shearOnWood += checker.IsFree(atCut) ? 0 : 1;
                for (var i = 0; i + 1 < candidate.ApproachPath.Count; i++)
                {
                    var group = i < candidate.PreCutIndex ? -1 : result.LimbGroup;
                    Assert.True(checker.IsEdgeFree(candidate.ApproachPath[i], candidate.ApproachPath[i + 1], group), $"{what}: approach edge {i} not free");
                    edges++;
                }
            }
        }

        output.WriteLine($"{scan.TreeId}: {results.Count(r => r.IsReachable)}/{results.Count} cuts reachable, {candidates} candidates, {edges} approach edges re-checked; " +
            $"{shearOnWood} cut configurations touch the limb (free only with it ignored); unreachable: {string.Join(", ", results.Where(r => !r.IsReachable).Select(r => $"{r.CutId} {r.Reason}"))}");
        Assert.True(results.Count(r => r.IsReachable) >= results.Count / 2);

        // The jaws straddle the wood: within the safety margin of it at the cut, so the ignore group is what lets most cuts happen.
        Assert.True(shearOnWood >= candidates / 2, $"{shearOnWood} of {candidates}");

        // Clear poses have the room asked for, or the retreat ran to its longest, or no further step out was possible.
        output.WriteLine($"{clearEnough} of {candidates} clear poses have {Settings.ClearanceTargetM * 1000:F0} mm of room; {ranToEnd} ran to the longest retreat; {stoppedShort} could go no further");
        Assert.True(clearEnough > candidates / 2, $"{clearEnough} of {candidates} clear poses have the room asked for");
    }

    /// <summary>
    /// Independently of the analyzer: the tool pose of the clear configuration, backed off one retreat step
    /// further along the approach (tool −z), solved from the clear configuration; true when that solution
    /// converges within the limits, does not jump, and it and the edge to it are free.
    /// </summary>
    private static bool OneMoreStepOut(WorkCell cell, CollisionChecker checker, CutCandidate candidate)
    {
        var clear = candidate.ClearConfiguration.ToArray();
        var pose = cell.Chain.ToolPose(clear);
        var target = new Pose3(pose.Rotation, pose.Translation - (pose.Rotation.ColumnZ * Settings.RetreatStepM));
        var next = new double[clear.Length];
        var attempt = new InverseKinematics(cell.Chain, Settings.InverseKinematics).SolveFromSeed(target, clear, next);
        return attempt.Converged && cell.Chain.WithinLimits(next)
            && clear.Zip(next).All(p => Math.Abs(p.First - p.Second) <= Settings.MaxApproachJointStep)
            && checker.IsFree(next) && checker.IsEdgeFree(clear, next);
    }

    [Fact]
    public void Wood_thicker_than_the_shear_is_rated_for_is_refused_and_wood_at_the_rating_is_not()
    {
        var scan = CollisionTestCells.Orchard.Trees[CollisionTestCells.TreeOtherBlock].Scan;
        var rating = CollisionTestCells.Profile.Tool.MaxCutDiameterMm;
        var reachable = Analysed[CollisionTestCells.TreeOtherBlock].Value.First(r => r.IsReachable).CutIndex;
        foreach (var (diameter, refused) in new[] { (rating + 0.1, true), (rating * 2, true), (rating, false) })
        {
            var changed = scan with { Cuts = scan.Cuts.Select((c, i) => i == reachable ? c with { DiameterMm = diameter } : c).ToArray() };
            var result = AnalyzeOne(changed, reachable);
            Assert.Equal(refused, result.Reason == UnreachableReason.AboveShearRating);
            Assert.Equal(!refused, result.IsReachable);
        }
    }

    [Fact]
    public void With_the_arm_5_m_away_every_cut_is_out_of_reach()
    {
        // The tree with the fewest cuts keeps this short: every cut makes the solver fail on every approach.
        var scan = CollisionTestCells.Orchard.Trees.Select(t => t.Scan).MinBy(s => s.Cuts.Count)!;
        var p = scan.ArmBase.PositionM;
        var far = scan with { ArmBase = scan.ArmBase with { PositionM = new Vector3M(p.X, p.Y + 5, p.Z) } };
        var results = ReachabilityAnalyzer.Analyze(new WorkCell(far, CollisionTestCells.Profile), Settings, Seed, CancellationToken.None);
        output.WriteLine($"{scan.TreeId}: {results.Count} cuts: {string.Join(", ", results.Select(r => $"{r.CutId} {r.Reason} ({r.Detail})"))}");
        Assert.Equal(scan.Cuts.Count, results.Count);
        Assert.All(results, r => Assert.Empty(r.Candidates));

        // The rating is checked first (wood too thick stays refused for that); every other cut is out of reach.
        var rating = CollisionTestCells.Profile.Tool.MaxCutDiameterMm;
        Assert.All(results, r => Assert.Equal(scan.Cuts[r.CutIndex].DiameterMm > rating ? UnreachableReason.AboveShearRating : UnreachableReason.OutOfReach, r.Reason));
        Assert.True(results.Count(r => r.Reason == UnreachableReason.OutOfReach) >= scan.Cuts.Count / 2);
    }

    [Fact]
    public void A_post_standing_through_the_cut_point_makes_a_reachable_cut_a_collision()
    {
        var tree = CollisionTestCells.TreeOtherBlock;
        var scan = CollisionTestCells.Orchard.Trees[tree].Scan;
        // Every other reachable cut, up to six (each takes a full analysis of the cut).
        var reachable = Analysed[tree].Value.Where(r => r.IsReachable).Select(r => r.CutIndex).Where((_, k) => k % 2 == 0).Take(6).ToList();
        foreach (var c in reachable)
        {
            var (point, _) = CutPointAndAxis(scan, scan.Cuts[c]);
            var post = new Obstacle("test-post", ObstacleKind.Post, new Vector3M(point.X, point.Y, 0), new Vector3M(point.X, point.Y, 3.3), 0.06);
            var result = AnalyzeOne(scan with { Obstacles = [.. scan.Obstacles, post] }, c);
            Assert.False(result.IsReachable, $"cut {scan.Cuts[c].Id} reachable through a post");
            Assert.Equal(UnreachableReason.Collision, result.Reason);
        }

        output.WriteLine($"{reachable.Count} reachable cuts of {scan.TreeId} each became a collision with a post through the cut point");
        Assert.True(reachable.Count >= 3);
    }

    [Fact]
    public void Analysing_the_same_tree_again_in_another_cut_order_gives_identical_results()
    {
        // A fresh work cell, checker and solver, the cuts taken last to first: each cut has its own random stream.
        var tree = CollisionTestCells.TreeOtherBlock;
        var first = Analysed[tree].Value;
        var cell = new WorkCell(CollisionTestCells.Orchard.Trees[tree].Scan, Orchard.Core.Demo.DemoArm.Create());
        var checker = cell.CreateChecker();
        var ik = new InverseKinematics(cell.Chain, Settings.InverseKinematics);
        var again = new CutReachability[cell.Scan.Cuts.Count];
        for (var c = again.Length - 1; c >= 0; c--)
        {
            again[c] = ReachabilityAnalyzer.AnalyzeCut(cell, checker, ik, Settings, c, DeterministicRandom.ForStream(Seed, (ulong)c));
        }

        Assert.Equal(OrchardJson.Serialize(first), OrchardJson.Serialize(again));
        Assert.Contains(first, r => r.IsReachable);
    }

    private static CutReachability AnalyzeOne(TreeScan scan, int cutIndex)
    {
        var cell = new WorkCell(scan, CollisionTestCells.Profile);
        var ik = new InverseKinematics(cell.Chain, Settings.InverseKinematics);
        return ReachabilityAnalyzer.AnalyzeCut(cell, cell.CreateChecker(), ik, Settings, cutIndex, DeterministicRandom.ForStream(Seed, (ulong)cutIndex));
    }

    /// <summary>The cut point on the branch axis and the branch direction, from the scan's nodes.</summary>
    private static (Vec3 Point, Vec3 Axis) CutPointAndAxis(TreeScan scan, Cut cut)
    {
        var branch = scan.Branches.Single(b => b.Id == cut.BranchId);
        var from = scan.Nodes.Single(n => n.Id == branch.FromNode);
        var to = scan.Nodes.Single(n => n.Id == branch.ToNode);
        var a = new Vec3(from.XM, from.YM, from.ZM);
        var b = new Vec3(to.XM, to.YM, to.ZM);
        return (a + ((b - a) * cut.PositionAlong), (b - a) / Vec3.Distance(a, b));
    }

    /// <summary>Angle between two directions, accurate for small angles (atan2 of |a × b| and a · b).</summary>
    private static double Angle(in Vec3 a, in Vec3 b) => Math.Atan2(Vec3.Cross(a, b).Length, Vec3.Dot(a, b));
}
