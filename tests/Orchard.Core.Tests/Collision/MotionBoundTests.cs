using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Randomness;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Collision;

public sealed class MotionBoundTests(ITestOutputHelper output)
{
    private const int Steps = 1000;
    private const int Pieces = 8;
    private const int SurfacePointsPerCapsule = 4;

    [Fact]
    public void No_point_of_link_k_moves_farther_than_MotionBoundM_over_a_joint_step()
    {
        // For random configurations and random joint steps (small to whole-range, all joints or one), every capsule
        // endpoint and random surface points of each link: the straight-line displacement, and the length of the path
        // it traces while q moves straight to q + Δq (a polyline of 8 chords, itself ≤ the arc length), are at most
        // MotionBoundM(|Δq|, k). The path length is what conservative advancement relies on.
        var cell = CollisionTestCells.Cell(CollisionTestCells.TreeWithPost);
        var arm = cell.Arm;
        var chain = cell.Chain;
        var brute = new BruteForceArm(cell.Profile, cell.Scan.ArmBase);
        var n = chain.JointCount;
        var random = new DeterministicRandom(0xB0D);
        var frames = new Pose3[Pieces + 1][];
        for (var p = 0; p <= Pieces; p++)
        {
            frames[p] = new Pose3[n + 1];
        }

        // How close paths come to the bound, over steps that keep the lift still (a lift move alone meets it exactly).
        var worstRatio = new double[n + 1];
        var points = 0;
        for (var s = 0; s < Steps; s++)
        {
            var q = ConfigurationSampler.Uniform(random, chain);
            var scale = Math.Pow(10, random.NextDouble(-4, 0));
            var single = random.NextBool(0.3) ? random.NextInt(n) : -1;
            var target = new double[n];
            var delta = new double[n];
            for (var j = 0; j < n; j++)
            {
                var move = (single < 0 || single == j) && (single >= 0 || random.NextBool(0.8)) ? scale * random.NextDouble(-1, 1) : 0;
                target[j] = Math.Clamp(q[j] + move, chain.LowerLimits[j], chain.UpperLimits[j]);
                delta[j] = Math.Abs(target[j] - q[j]);
            }

            for (var p = 0; p <= Pieces; p++)
            {
                brute.Frames(JointSpace.Lerp(q, target, (double)p / Pieces), frames[p]);
            }

            for (var i = 0; i < arm.LocalCapsules.Length; i++)
            {
                var link = arm.LinkOfCapsule[i];
                var bound = arm.MotionBoundM(delta, link);
                var c = arm.LocalCapsules[i];
                for (var k = 0; k < 2 + SurfacePointsPerCapsule; k++)
                {
                    var local = k switch
                    {
                        0 => c.A,
                        1 => c.B,
                        _ => Vec3.Lerp(c.A, c.B, random.NextDouble()) + (new Vec3(random.NextGaussian(), random.NextGaussian(), random.NextGaussian()).Normalized() * c.RadiusM),
                    };
                    var path = 0.0;
                    for (var p = 1; p <= Pieces; p++)
                    {
                        path += Vec3.Distance(BruteForceArm.Apply(frames[p - 1][link], local), BruteForceArm.Apply(frames[p][link], local));
                    }

                    var displacement = Vec3.Distance(BruteForceArm.Apply(frames[0][link], local), BruteForceArm.Apply(frames[Pieces][link], local));
                    Assert.True(displacement <= bound + 1e-12, $"step {s}, capsule {i} (link {link}), point {k}: moved {displacement:R} m, bound {bound:R} m");
                    Assert.True(path <= bound + 1e-12, $"step {s}, capsule {i} (link {link}), point {k}: path {path:R} m, bound {bound:R} m");
                    if (bound > 0 && delta[0] == 0)
                    {
                        worstRatio[link] = Math.Max(worstRatio[link], path / bound);
                    }

                    points++;
                }
            }
        }

        output.WriteLine($"{Steps} steps, {points} point paths; largest path / bound per link with the lift still: {string.Join(", ", worstRatio.Select(r => r.ToString("F2")))}");

        // The bound is not vacuous: single-joint turns of stretched links come close to it.
        Assert.True(worstRatio.Max() >= 0.5, "the bound is far looser than any motion seen");
        Assert.True(worstRatio[arm.ToolLink] >= 0.3, "the tool's bound is far looser than any motion seen");
    }

    [Fact]
    public void The_reach_table_has_the_documented_shape()
    {
        var arm = CollisionTestCells.Cell(CollisionTestCells.TreeWithPost).Arm;
        var profile = CollisionTestCells.Profile;
        var n = arm.JointCount;
        for (var j = 0; j < n; j++)
        {
            for (var k = 0; k <= n; k++)
            {
                var reach = arm.ReachFromJoint[j, k];
                if (k < j)
                {
                    Assert.Equal(0, reach);
                }
                else if (profile.Joints[j].Kind == JointKind.Prismatic)
                {
                    Assert.Equal(1, reach); // a slide moves every point beyond it exactly as far as itself
                }
                else
                {
                    Assert.True(reach > 0);
                }
            }
        }

        // No motion, no bound; and the bound is additive over joints.
        Assert.Equal(0, arm.MotionBoundM(new double[n], n));
        var one = new double[n];
        one[2] = 0.1;
        var two = new double[n];
        two[4] = 0.2;
        var both = one.Zip(two, (a, b) => a + b).ToArray();
        Assert.Equal(arm.MotionBoundM(one, n) + arm.MotionBoundM(two, n), arm.MotionBoundM(both, n), 1e-15);
    }
}
