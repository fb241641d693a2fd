using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;
using Orchard.Core.Tests.Geometry;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Collision;

public sealed class ConfigurationCheckTests(ITestOutputHelper output)
{
    /// <summary>Distances computed by two different formulas agree to rounding; a verdict this close to a margin is a tie.</summary>
    private const double TieM = 1e-9;

    private const int UniformPerTree = 2600;
    private const int IkBasesPerTree = 100;
    private const int PerturbationsPerBase = 24;
    private const int OutOfLimitsPerTree = 50;

    private static readonly double[] Sigmas = [0.003, 0.01, 0.03, 0.1];

    [Fact]
    public void The_brute_force_segment_distance_matches_the_golden_section_reference()
    {
        // The oracle's own oracle: BruteForceDistance (grid plus nested golden-section search) never undercuts the
        // minimum and gets within ~1e-12 of it, on segments like the arm's and the tree's (a few cm to 3 m), including
        // parallel, crossing and degenerate pairs.
        var random = new DeterministicRandom(7100);
        for (var i = 0; i < 600; i++)
        {
            var p1 = RandomPoint(random);
            var q1 = (i % 7) switch
            {
                0 => p1,
                _ => p1 + (RandomDirection(random) * random.NextDouble(0.02, 3)),
            };
            var p2 = (i % 5 == 0) ? p1 + (RandomDirection(random) * random.NextDouble(0, 0.2)) : RandomPoint(random);
            var q2 = (i % 3) switch
            {
                0 => p2 + ((q1 - p1) * random.NextDouble(-2, 2)), // parallel to the first
                _ => p2 + (RandomDirection(random) * random.NextDouble(0, 3)),
            };
            var mine = Math.Sqrt(BruteForceSegments.DistanceSquared(p1, q1, p2, q2));
            var reference = Math.Sqrt(BruteForceDistance.SegmentSegmentDistanceSquared(p1, q1, p2, q2));
            Assert.True(Math.Abs(mine - reference) <= 1e-9, $"pair {i}: enumeration {mine:R}, golden section {reference:R}");
        }
    }

    [Fact]
    public void IsFree_and_Check_agree_with_a_brute_force_checker_on_over_10000_configurations_of_two_demo_trees()
    {
        var totals = new Counts();
        foreach (var tree in new[] { CollisionTestCells.TreeWithPost, CollisionTestCells.TreeOtherBlock })
        {
            var counts = RunTree(tree);
            output.WriteLine($"{CollisionTestCells.Orchard.Trees[tree].Scan.TreeId}: {counts}");

            // Each tree on its own exercises both outcomes in bulk.
            Assert.True(counts.Free >= 1000 && counts.Colliding >= 1000, counts.ToString());
            totals.Add(counts);
        }

        output.WriteLine($"total: {totals}");
        Assert.True(totals.Configurations >= 10_000, totals.ToString());
        Assert.True(totals.Free >= 3000 && totals.Colliding >= 3000, totals.ToString());

        // Every kind of contact is met, not only self collisions of random configurations.
        Assert.True(totals.ClosestWood >= 500 && totals.ClosestSelf >= 500, totals.ToString());
        Assert.True(totals.ClosestTrellis >= 10 && totals.ClosestGround >= 5, totals.ToString());

        // The tool-ignore group matters: many shear-on-wood configurations are free only with their limb ignored.
        Assert.True(totals.FreeOnlyWhenIgnoring >= 100, totals.ToString());

        // ... and it is the tool's alone: often a link within the margin of the ignored group is all that makes a
        // configuration collide (ignoring the group for every capsule would call these free).
        Assert.True(totals.LinkKeptOffIgnoredGroup >= 50, totals.ToString());

        // Clearances are compared exactly (below the cap) almost everywhere; ties with a margin are vanishingly rare.
        Assert.True(totals.ExactClearance >= 0.9 * totals.Evaluations, totals.ToString());
        Assert.True(totals.Ties <= 2, totals.ToString());
    }

    private static Counts RunTree(int tree)
    {
        var cell = CollisionTestCells.Cell(tree);
        var brute = new BruteForceChecker(cell.Scene, cell.Arm, new BruteForceArm(cell.Profile, cell.Scan.ArmBase), cell.Settings);
        AssertSameArmModel(cell.Arm, brute.Arm);
        var checker = cell.CreateChecker();
        var chain = cell.Chain;
        var random = new DeterministicRandom(0xC0FFEEUL + (ulong)tree);
        var counts = new Counts();

        // Uniform within the limits; every tenth with a random limb ignored for the tool (harmless far from that limb),
        // every tenth with the group nearest to the links (not the tool) ignored, which must change nothing for them.
        for (var k = 0; k < UniformPerTree; k++)
        {
            var q = ConfigurationSampler.Uniform(random, chain);
            var group = (k % 10) switch
            {
                0 => random.NextInt(cell.Scene.LimbCount),
                1 => brute.NearestGroupToLinks(q),
                _ => CapsuleBvh.NoGroup,
            };
            Compare(checker, brute, q, group, counts, $"uniform {k}");
            counts.Configurations++;
        }

        // Near the wood: inverse kinematics to a shear pose on a random branch, then small perturbations of it. One in
        // three with the branch's limb ignored for the tool, as during a cut's final approach; one in three with the
        // group nearest to the links ignored (for the tool only, so the links must still keep clear of it).
        var ik = new InverseKinematics(chain, ConfigurationSampler.NearWoodIk);
        var bases = 0;
        for (var attempt = 0; bases < IkBasesPerTree; attempt++)
        {
            Assert.True(attempt < 4 * IkBasesPerTree, $"inverse kinematics found only {bases} near-wood configurations in {attempt} tries");
            if (!ConfigurationSampler.TryNearWood(cell, ik, random, out var solution, out var limb))
            {
                continue;
            }

            bases++;
            for (var p = 0; p <= PerturbationsPerBase; p++)
            {
                var q = p == 0 ? solution : ConfigurationSampler.Perturbed(random, chain, solution, Sigmas[p % Sigmas.Length]);
                var group = (p % 3) switch
                {
                    0 => limb,
                    1 => brute.NearestGroupToLinks(q),
                    _ => CapsuleBvh.NoGroup,
                };
                var verdict = Compare(checker, brute, q, group, counts, $"near wood {bases}.{p}");
                if (group == limb && verdict.IsFree && !brute.Evaluate(q, CapsuleBvh.NoGroup).IsFree)
                {
                    counts.FreeOnlyWhenIgnoring++;
                }

                if (group != CapsuleBvh.NoGroup && !verdict.IsFree && brute.Evaluate(q, group, ignoreForEveryCapsule: true).IsFree)
                {
                    counts.LinkKeptOffIgnoredGroup++;
                }

                counts.Configurations++;
            }
        }

        // Just outside a limit: refused by both, and reported as a joint-limit contact at −∞.
        for (var k = 0; k < OutOfLimitsPerTree; k++)
        {
            var q = ConfigurationSampler.Uniform(random, chain);
            var j = random.NextInt(q.Length);
            q[j] = random.NextBool(0.5) ? chain.UpperLimits[j] + random.NextDouble(1e-9, 0.1) : chain.LowerLimits[j] - random.NextDouble(1e-9, 0.1);
            Assert.False(checker.IsFree(q));
            Assert.Equal(new ConfigurationReport(false, double.NegativeInfinity, ContactKind.JointLimit), checker.Check(q));
            Assert.False(brute.Evaluate(q, CapsuleBvh.NoGroup).WithinLimits);
            counts.Configurations++;
        }

        return counts;
    }

    private static BruteForceVerdict Compare(CollisionChecker checker, BruteForceChecker brute, double[] q, int group, Counts counts, string what)
    {
        var verdict = brute.Evaluate(q, group);
        Assert.True(verdict.WithinLimits, what);
        counts.Evaluations++;

        // The two forward kinematics agree to rounding.
        var expectedTool = brute.Arm.ToolPose(q);
        var actualTool = checker.Arm.Chain.ToolPose(q);
        Assert.True(Vec3.Distance(expectedTool.Translation, actualTool.Translation) <= 1e-12, $"{what}: TCP differs");

        var free = checker.IsFree(q, group);
        var report = checker.Check(q, group);
        var cap = checker.Settings.DistanceCapM;
        if (verdict.ClearanceM < cap)
        {
            counts.ExactClearance++;
            Assert.True(
                Math.Abs(report.ClearanceM - verdict.ClearanceM) <= 1e-9,
                $"{what} (group {group}): Check clearance {report.ClearanceM:R}, brute force {verdict.ClearanceM:R} ({verdict.Closest})");
        }
        else
        {
            // Nothing within the cap: the scene's distances are reported as the cap itself.
            Assert.True(Math.Abs(report.ClearanceM - cap) <= 1e-9, $"{what}: Check clearance {report.ClearanceM:R} with nothing nearer than {cap} m");
        }

        if (Math.Abs(verdict.LeastRoomM) < TieM)
        {
            counts.Ties++;
            return verdict;
        }

        Assert.True(free == verdict.IsFree, $"{what} (group {group}): IsFree {free}, brute force {verdict.IsFree} (least room {verdict.LeastRoomM:R} m, closest {verdict.Closest})");
        Assert.True(report.IsFree == verdict.IsFree, $"{what} (group {group}): Check.IsFree {report.IsFree}, brute force {verdict.IsFree} (least room {verdict.LeastRoomM:R} m)");
        if (verdict.IsFree)
        {
            counts.Free++;
            Assert.Equal(ContactKind.None, report.Contact);
        }
        else
        {
            counts.Colliding++;
            counts.Closest(verdict.Closest);

            // The report names what is closest (documented: "what is closest or in contact").
            if (verdict.KindGapM > TieM)
            {
                Assert.True(verdict.Closest == report.Contact, $"{what}: Check says {report.Contact}, brute force's closest is {verdict.Closest}");
            }
        }

        return verdict;
    }

    /// <summary>The project's flattened arm model lists the profile's capsules in the order the brute force assumes.</summary>
    private static void AssertSameArmModel(ArmCollisionModel model, BruteForceArm arm)
    {
        Assert.Equal(arm.LocalCapsules.Count, model.LocalCapsules.Length);
        Assert.Equal(arm.FirstToolCapsule, model.FirstToolCapsule);
        Assert.Equal(arm.ToolLink, model.ToolLink);
        for (var i = 0; i < model.LocalCapsules.Length; i++)
        {
            Assert.Equal(arm.LocalCapsules[i], model.LocalCapsules[i]);
            Assert.Equal(arm.LinkOfCapsule[i], model.LinkOfCapsule[i]);
        }

        Assert.Equal(arm.BaseCapsulesInTree.Count, model.BaseCapsulesInRoot.Length);
        for (var i = 0; i < model.BaseCapsulesInRoot.Length; i++)
        {
            Assert.True(Vec3.Distance(arm.BaseCapsulesInTree[i].A, model.BaseCapsulesInRoot[i].A) <= 1e-12);
            Assert.True(Vec3.Distance(arm.BaseCapsulesInTree[i].B, model.BaseCapsulesInRoot[i].B) <= 1e-12);
        }

        // Self pairs: exactly the pairs on links two or more apart, less those that touch nearly always; base pairs:
        // every capsule past the first link.
        var all = new HashSet<(int, int)>(model.SelfPairs.Concat(model.AlwaysTouchingPairs));
        var expected = new HashSet<(int, int)>();
        for (var a = 0; a < arm.LocalCapsules.Count; a++)
        {
            for (var b = a + 1; b < arm.LocalCapsules.Count; b++)
            {
                if (Math.Abs(arm.LinkOfCapsule[a] - arm.LinkOfCapsule[b]) >= 2)
                {
                    expected.Add((a, b));
                }
            }
        }

        Assert.True(expected.SetEquals(all));
        Assert.Equal(model.SelfPairs.Length + model.AlwaysTouchingPairs.Length, all.Count);
        Assert.Equal(Enumerable.Range(0, arm.LocalCapsules.Count).Where(i => arm.LinkOfCapsule[i] >= 1), model.BasePairs);
    }

    private static Vec3 RandomPoint(DeterministicRandom random) =>
        new(random.NextDouble(-1.5, 1.5), random.NextDouble(-1, 1.5), random.NextDouble(0, 3.5));

    private static Vec3 RandomDirection(DeterministicRandom random) =>
        new Vec3(random.NextGaussian(), random.NextGaussian(), random.NextGaussian()).Normalized();

    private sealed class Counts
    {
        public int Configurations { get; set; }

        public int Evaluations { get; set; }

        public int Free { get; set; }

        public int Colliding { get; set; }

        public int Ties { get; set; }

        public int ExactClearance { get; set; }

        public int FreeOnlyWhenIgnoring { get; set; }

        public int LinkKeptOffIgnoredGroup { get; set; }

        public int ClosestWood { get; private set; }

        public int ClosestTrellis { get; private set; }

        public int ClosestGround { get; private set; }

        public int ClosestSelf { get; private set; }

        public void Closest(ContactKind kind)
        {
            switch (kind)
            {
                case ContactKind.Wood: ClosestWood++; break;
                case ContactKind.Trellis: ClosestTrellis++; break;
                case ContactKind.Ground: ClosestGround++; break;
                case ContactKind.Self: ClosestSelf++; break;
                default: break;
            }
        }

        public void Add(Counts other)
        {
            Configurations += other.Configurations;
            Evaluations += other.Evaluations;
            Free += other.Free;
            Colliding += other.Colliding;
            Ties += other.Ties;
            ExactClearance += other.ExactClearance;
            FreeOnlyWhenIgnoring += other.FreeOnlyWhenIgnoring;
            LinkKeptOffIgnoredGroup += other.LinkKeptOffIgnoredGroup;
            ClosestWood += other.ClosestWood;
            ClosestTrellis += other.ClosestTrellis;
            ClosestGround += other.ClosestGround;
            ClosestSelf += other.ClosestSelf;
        }

        public override string ToString() =>
            $"{Configurations} configurations, {Evaluations} compared: {Free} free, {Colliding} colliding (closest: wood {ClosestWood}, trellis {ClosestTrellis}, ground {ClosestGround}, self {ClosestSelf}), " +
            $"{FreeOnlyWhenIgnoring} free only with the limb ignored, {LinkKeptOffIgnoredGroup} colliding only through a link at the ignored group, {ExactClearance} exact clearances, {Ties} ties";
    }
}
