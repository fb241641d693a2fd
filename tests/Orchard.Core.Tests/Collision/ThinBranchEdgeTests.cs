using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Randomness;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// Conservative advancement cannot step over thin wood. Each case: an edge between two open configurations that
/// IsEdgeFree proves free with nothing around but the ground; a point on the core of a moving capsule (a shear jaw, or
/// any link) at q(t), t in (0.2, 0.8); a 5 mm branch, 0.3 m long, through that point perpendicular to the point's
/// motion; kept when both ends are still free with the branch there. IsEdgeFree must then refuse the edge, and a
/// plain check of 10 evenly spaced samples shows what it guards against by calling some of them free.
/// </summary>
public sealed class ThinBranchEdgeTests(ITestOutputHelper output)
{
    private const int Cases = 500;
    private const int PlacementsPerEdge = 20;
    private const double BranchRadiusM = 0.0025;
    private const double BranchHalfLengthM = 0.15;
    private const int CoarseSamples = 10;

    [Fact]
    public void A_5_mm_branch_across_the_swept_path_between_two_free_ends_is_never_missed()
    {
        // Nothing but the ground and the arm itself, so that whatever stops an edge below is the one branch.
        var demoScan = CollisionTestCells.Orchard.Trees[CollisionTestCells.TreeWithPost].Scan;
        var emptyScan = CollisionTestCells.EmptyScan(demoScan);
        var emptyCell = new WorkCell(emptyScan, CollisionTestCells.Profile);
        var open = emptyCell.CreateChecker();
        var arm = emptyCell.Arm;
        var chain = emptyCell.Chain;
        var brute = new BruteForceArm(CollisionTestCells.Profile, demoScan.ArmBase);
        var random = new DeterministicRandom(0x5B4A);

        // Start and end in open configurations (no part of the arm within 3 cm of another or of the ground; the turret
        // always stands 5 cm from the mast): such edges take fewer advancement steps.
        var pool = new List<double[]>();
        for (var attempt = 0; pool.Count < 200; attempt++)
        {
            Assert.True(attempt < 100_000, "open configurations are too rare");
            var q = ConfigurationSampler.Uniform(random, chain);
            if (open.Check(q).ClearanceM >= 0.03)
            {
                pool.Add(q);
            }
        }

        var openSteps = 0L;
        var branchSteps = 0L;

        int cases = 0, missedByCoarse = 0, endsTouching = 0, slowPoints = 0, edgesTried = 0, edgesUsed = 0;
        var kinds = new Dictionary<ContactKind, int>();
        var lengths = new List<double>();
        var speedToBound = new List<double>();
        while (cases < Cases)
        {
            Assert.True(edgesTried < 20 * Cases, $"only {cases} cases in {edgesTried} edges");
            edgesTried++;
            var from = pool[random.NextInt(pool.Count)];
            // A third each: to another open configuration, a random joint-space step, one joint turned alone (where
            // far points move at nearly the motion bound, so an overlong advancement step would overshoot).
            var shape = random.NextInt(3);
            var to = shape switch
            {
                0 => pool[random.NextInt(pool.Count)],
                1 => JointSpace.Step(random, chain, from, random.NextDouble(0.3, 2.0)),
                _ => JointSpace.TurnOneJoint(random, chain, from, random.NextDouble(0.5, 2.0)),
            };
            var before = open.ClearanceEvaluations;
            var openEdge = open.IsFree(to) && open.IsEdgeFree(from, to);
            openSteps += open.ClearanceEvaluations - before;
            if (!openEdge)
            {
                continue;
            }

            edgesUsed++;
            for (var placement = 0; placement < PlacementsPerEdge && cases < Cases; placement++)
            {
                // A point on the core of some moving capsule: a shear jaw half the time, else any link or the tool.
                var capsule = random.NextBool(shape == 2 ? 0.75 : 0.5) ? arm.FirstToolCapsule + 2 + random.NextInt(2) : random.NextInt(arm.LocalCapsules.Length);
                var local = Vec3.Lerp(arm.LocalCapsules[capsule].A, arm.LocalCapsules[capsule].B, random.NextDouble());
                var link = arm.LinkOfCapsule[capsule];
                var t = random.NextDouble(0.2, 0.8);
                var point = brute.PointInTree(JointSpace.Lerp(from, to, t), link, local);
                const double h = 1e-5;
                var velocity = (brute.PointInTree(JointSpace.Lerp(from, to, t + h), link, local) - brute.PointInTree(JointSpace.Lerp(from, to, t - h), link, local)) / (2 * h);
                if (velocity.Length < 0.05)
                {
                    slowPoints++; // the point hardly moves along this edge: a branch there would touch the ends too
                    continue;
                }

                // The branch: 0.3 m long through that point, perpendicular to its motion.
                var motion = velocity.Normalized();
                var w = new Vec3(random.NextGaussian(), random.NextGaussian(), random.NextGaussian());
                var across = (w - (motion * Vec3.Dot(w, motion))).Normalized();
                var checker = new CollisionChecker(Scene.FromScan(WithOneBranch(emptyScan, point - (across * BranchHalfLengthM), point + (across * BranchHalfLengthM))), arm);
                if (!checker.IsFree(from) || !checker.IsFree(to))
                {
                    endsTouching++;
                    continue;
                }

                cases++;
                var delta = new double[from.Length];
                for (var j = 0; j < delta.Length; j++)
                {
                    delta[j] = Math.Abs(to[j] - from[j]);
                }

                speedToBound.Add(velocity.Length / arm.MotionBoundM(delta, link));
                lengths.Add(Vec3.Distance(brute.PointInTree(from, link, local), brute.PointInTree(to, link, local)));

                // The construction is right: the branch runs through the capsule's core at q(t).
                Assert.False(checker.IsFree(JointSpace.Lerp(from, to, t)), $"case {cases}: q(t) is free");

                Assert.False(checker.IsEdgeFree(from, to), $"case {cases}: the edge through a 5 mm branch at t = {t:F3} was called free");
                branchSteps += checker.ClearanceEvaluations;
                if (cases % 10 == 0)
                {
                    var kind = checker.CheckEdge(from, to);
                    kinds[kind] = kinds.GetValueOrDefault(kind) + 1;
                }

                var coarseFree = true;
                for (var i = 0; i < CoarseSamples && coarseFree; i++)
                {
                    coarseFree = checker.IsFree(JointSpace.Lerp(from, to, (double)i / (CoarseSamples - 1)));
                }

                missedByCoarse += coarseFree ? 1 : 0;
            }
        }

        lengths.Sort();
        speedToBound.Sort();
        output.WriteLine($"{cases} cases on {edgesUsed} free edges ({edgesTried} tried); {endsTouching} placements touched an end, {slowPoints} points too slow");
        output.WriteLine($"probe point travel along the edge: median {lengths[lengths.Count / 2]:F2} m, max {lengths[^1]:F2} m");
        output.WriteLine($"probe speed at the crossing / its link's motion bound: median {speedToBound[speedToBound.Count / 2]:F2}, max {speedToBound[^1]:F2}, {speedToBound.Count(r => r > 0.8)} cases above 0.8");
        output.WriteLine($"IsEdgeFree refused all {cases}; CheckEdge on every tenth: {string.Join(", ", kinds.Select(k => $"{k.Key} {k.Value}"))}");
        output.WriteLine($"advancement steps: {openSteps} proving edges free without the branch, {branchSteps} refusing them with it");
        output.WriteLine($"a {CoarseSamples}-sample fixed-resolution check called {missedByCoarse} of them free");

        // Why the method matters: sampling at a fixed step steps over a thin branch that the swept arm crosses.
        Assert.True(missedByCoarse >= 1, "the coarse check missed nothing; the cases are too easy to show the point");

        // Some crossings move at nearly the motion bound, where an advancement step longer than the bound allows
        // would carry the point past the branch.
        Assert.True(speedToBound.Count(r => r > 0.8) >= 5, "no crossing near the motion bound");
    }

    private static TreeScan WithOneBranch(TreeScan scan, in Vec3 from, in Vec3 to) => scan with
    {
        Nodes = [new ScanNode("n0", from.X, from.Y, from.Z), new ScanNode("n1", to.X, to.Y, to.Z)],
        Branches = [new Branch("b0", "n0", "n1", BranchRadiusM, BranchRadiusM)],
    };
}
