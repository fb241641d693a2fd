using Orchard.Core.Demo;
using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Reachability;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Service.Cli;

namespace Orchard.Core.Tests.Demo;

public sealed class DemoOrchardTests
{
    private static readonly DemoOrchard Default = DemoOrchard.Generate();

    [Fact]
    public void The_default_orchard_has_two_blocks_six_rows_and_at_least_24_trees()
    {
        Assert.True(Default.Blocks.Count() >= 2);
        Assert.True(Default.Rows.Count >= 6);
        Assert.True(Default.Trees.Count >= 24);
        Assert.Equal(Default.Trees.Count, Default.Trees.Select(t => t.Scan.TreeId).Distinct().Count());
    }

    [Fact]
    public void Every_demo_scan_validates_with_no_errors()
    {
        var big = DemoOrchard.Generate(new DemoOrchardSettings(Seed: 99, TreesPerRow: 20));
        var shear = DemoArm.Create().Tool.MaxCutDiameterMm;
        foreach (var tree in Default.Trees.Concat(big.Trees))
        {
            var report = TreeScanValidator.Validate(tree.Scan, shearRatingMm: shear);
            Assert.True(report.IsValid, $"{tree.Scan.TreeId}: {string.Join("; ", report.Errors.Select(e => $"{e.Path} {e.Message}"))}");
        }
    }

    [Fact]
    public void Spacing_and_heights_sit_in_the_tall_spindle_ranges()
    {
        foreach (var row in Default.Rows)
        {
            Assert.InRange(row.InRowSpacingM, 0.9, 1.2);
            Assert.InRange(row.RowSpacingM, 3.4, 3.7);
        }

        foreach (var tree in DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 10)).Trees)
        {
            Assert.InRange(tree.Scan.Nodes.Max(n => n.ZM), 3.0, 3.7);
        }
    }

    [Fact]
    public void Trees_carry_roughly_ten_to_sixty_cuts_of_thinning_heading_and_renewal_kinds()
    {
        var trees = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 10)).Trees;
        Assert.All(trees, t => Assert.InRange(t.Scan.Cuts.Count, 10, 60));
        var cuts = trees.SelectMany(t => t.Scan.Cuts).ToList();
        Assert.Contains(cuts, c => c.Kind == CutKind.Thinning);
        Assert.Contains(cuts, c => c.Kind == CutKind.Heading);
        Assert.Contains(cuts, c => c.Kind == CutKind.Renewal && c.StubLengthM == PruningRuleSettings.Default.ThinningStubM);
        foreach (var tree in trees)
        {
            foreach (var renewal in tree.Scan.Cuts.Where(c => c.Kind == CutKind.Renewal))
            {
                // The scan's positionAlong says exactly where the kind puts the cut.
                Assert.Equal(CutPlacement.PositionAlong(tree.Scan, renewal), renewal.PositionAlong, 1e-9);
            }
        }

        // Some wood is too thick for the 20 mm shear, so the above-rating path is exercised.
        Assert.Contains(cuts, c => c.DiameterMm > DemoArm.Create().Tool.MaxCutDiameterMm);
    }

    [Fact]
    public void Renewal_or_thinning_cuts_remove_laterals_thicker_than_half_the_leader()
    {
        // The rule: a lateral whose base is over half the leader's diameter where it attaches is taken out (by a
        // renewal cut, or a thinning cut where the stub would not land well on its first piece), unless it sits
        // above a heading cut on the leader (it goes with the leader's top).
        var checkedLaterals = 0;
        foreach (var tree in Default.Trees)
        {
            var scan = tree.Scan;
            var nodes = scan.Nodes.ToDictionary(n => n.Id);
            var leader = LeaderBranches(scan, nodes);
            var headedAtM = scan.Cuts.Where(c => c.Kind == CutKind.Heading && leader.Contains(c.BranchId))
                .Select(c => nodes[scan.Branches.First(b => b.Id == c.BranchId).FromNode].ZM).DefaultIfEmpty(double.PositiveInfinity).Min();
            var thinned = scan.Cuts.Where(c => c.Kind is CutKind.Thinning or CutKind.Renewal).Select(c => c.BranchId).ToHashSet();
            var leaderInto = scan.Branches.Where(b => leader.Contains(b.Id)).ToDictionary(b => b.ToNode);
            foreach (var lateral in scan.Branches.Where(b => !leader.Contains(b.Id) && leaderInto.ContainsKey(b.FromNode)))
            {
                if (nodes[lateral.FromNode].ZM < headedAtM && lateral.FromRadiusM > (0.5 * leaderInto[lateral.FromNode].ToRadiusM) + 1e-5)
                {
                    Assert.Contains(lateral.Id, thinned);
                    checkedLaterals++;
                }
            }
        }

        Assert.True(checkedLaterals > 10, "the rule was exercised");
    }

    /// <summary>The leader: from the root, always the most upright child branch.</summary>
    private static HashSet<string> LeaderBranches(TreeScan scan, Dictionary<string, ScanNode> nodes)
    {
        var leader = new HashSet<string>();
        var node = scan.Nodes[0].Id;
        while (true)
        {
            var next = scan.Branches.Where(b => b.FromNode == node).MaxBy(b =>
            {
                var (f, t) = (nodes[b.FromNode], nodes[b.ToNode]);
                var length = Math.Sqrt(Math.Pow(t.XM - f.XM, 2) + Math.Pow(t.YM - f.YM, 2) + Math.Pow(t.ZM - f.ZM, 2));
                return (t.ZM - f.ZM) / length;
            });
            if (next is null)
            {
                return leader;
            }

            leader.Add(next.Id);
            node = next.ToNode;
        }
    }

    [Fact]
    public void The_arm_base_faces_the_row_from_the_aisle()
    {
        foreach (var tree in Default.Trees)
        {
            var pose = tree.Scan.ArmBase;
            Assert.InRange(pose.PositionM.Y, 0.8, 1.1);
            var facing = Rot3.FromRpy(0, 0, pose.YawRad) * Vec3.UnitX;
            Assert.True(facing.Y < -0.99, "the base's x axis points at the row (towards −y)");
        }
    }

    [Fact]
    public void One_seed_gives_the_same_orchard_and_another_seed_a_different_one()
    {
        string Json(DemoOrchard o) => string.Join('\n', o.Trees.Select(t => OrchardJson.Serialize(t.Scan)));
        Assert.Equal(Json(DemoOrchard.Generate()), Json(DemoOrchard.Generate()));
        Assert.NotEqual(Json(DemoOrchard.Generate()), Json(DemoOrchard.Generate(new DemoOrchardSettings(Seed: 1))));
    }

    [Fact]
    public void Adding_trees_to_a_row_does_not_change_the_trees_already_there()
    {
        var small = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 2)).Trees;
        var large = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 6)).Trees;
        Assert.Equal(OrchardJson.Serialize(small[0].Scan), OrchardJson.Serialize(large[0].Scan));
        Assert.Equal(OrchardJson.Serialize(small[1].Scan), OrchardJson.Serialize(large[1].Scan));
    }

    [Fact]
    public async Task Export_twice_with_one_seed_gives_byte_identical_files()
    {
        var first = Path.Combine(Path.GetTempPath(), "orchard-export-" + Guid.NewGuid().ToString("N"));
        var second = Path.Combine(Path.GetTempPath(), "orchard-export-" + Guid.NewGuid().ToString("N"));
        try
        {
            var a = await DemoExporter.ExportAsync(DemoOrchard.Generate(), DemoArm.Create(), first, CancellationToken.None);
            var b = await DemoExporter.ExportAsync(DemoOrchard.Generate(), DemoArm.Create(), second, CancellationToken.None);
            Assert.Equal(a.Select(Path.GetFileName), b.Select(Path.GetFileName));
            Assert.Equal(Default.Trees.Count + 2, a.Count);
            foreach (var (x, y) in a.Zip(b))
            {
                Assert.Equal(await File.ReadAllBytesAsync(x), await File.ReadAllBytesAsync(y));
            }

            // What was written reads back and validates.
            var scan = OrchardJson.Parse<TreeScan>(await File.ReadAllTextAsync(a[0]));
            Assert.True(scan.Succeeded);
            Assert.True(TreeScanValidator.Validate(scan.Value).IsValid);
            var arm = OrchardJson.Parse<ArmProfile>(await File.ReadAllTextAsync(Path.Combine(first, "arm.json")));
            Assert.True(arm.Succeeded);
            Assert.Empty(ArmProfileValidator.Validate(arm.Value).Problems);
        }
        finally
        {
            Directory.Delete(first, recursive: true);
            Directory.Delete(second, recursive: true);
        }
    }

    [Fact]
    public void A_scan_survives_a_json_round_trip_unchanged()
    {
        var scan = Default.Trees[3].Scan;
        var json = OrchardJson.Serialize(scan);
        var back = OrchardJson.Parse<TreeScan>(json);
        Assert.True(back.Succeeded);
        Assert.Equal(json, OrchardJson.Serialize(back.Value));
        Assert.Contains("\"diameterMm\"", json, StringComparison.Ordinal);
        Assert.Contains("\"thinning\"", json, StringComparison.Ordinal);
    }
}
