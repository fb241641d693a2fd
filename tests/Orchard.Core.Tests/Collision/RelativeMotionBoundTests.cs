using Orchard.Core.Collision;
using Orchard.Core.Demo;
using Orchard.Core.Geometry;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// The bound advancement uses for a pair of links: the distance between any two capsules of links a
/// and b changes by no more than <see cref="ArmCollisionModel.RelativeMotionBoundM"/> along a straight
/// joint-space step (checked by sampling the step finely and summing the changes).
/// </summary>
public sealed class RelativeMotionBoundTests
{
    [Fact]
    public void Pair_distances_change_no_faster_than_the_relative_bound()
    {
        var cell = new WorkCell(DemoOrchard.Generate().Trees[0].Scan, DemoArm.Create());
        var arm = cell.Arm;
        var chain = cell.Chain;
        var n = chain.JointCount;
        var random = new DeterministicRandom(31);
        var frames = new Pose3[n];
        var world = new Capsule[arm.LocalCapsules.Length];
        var previous = new double[arm.SelfPairs.Length];
        var travelled = new double[arm.SelfPairs.Length];
        var delta = new double[n];
        var q = new double[n];
        var tightest = 0.0;
        for (var trial = 0; trial < 300; trial++)
        {
            var a = Enumerable.Range(0, n).Select(j => random.NextDouble(chain.LowerLimits[j], chain.UpperLimits[j])).ToArray();
            var b = Enumerable.Range(0, n).Select(j => Math.Clamp(a[j] + (random.NextGaussian() * 0.4), chain.LowerLimits[j], chain.UpperLimits[j])).ToArray();
            for (var j = 0; j < n; j++)
            {
                delta[j] = Math.Abs(b[j] - a[j]);
            }

            Array.Clear(travelled);
            const int steps = 200;
            for (var s = 0; s <= steps; s++)
            {
                for (var j = 0; j < n; j++)
                {
                    q[j] = a[j] + ((b[j] - a[j]) * s / steps);
                }

                chain.ForwardKinematics(q, frames);
                var tool = frames[^1] * chain.ToolInLastLink;
                for (var i = 0; i < world.Length; i++)
                {
                    world[i] = arm.LocalCapsules[i].Transformed(arm.LinkOfCapsule[i] == arm.ToolLink ? tool : frames[arm.LinkOfCapsule[i]]);
                }

                for (var p = 0; p < arm.SelfPairs.Length; p++)
                {
                    var d = CapsuleDistance.SignedDistance(world[arm.SelfPairs[p].A], world[arm.SelfPairs[p].B]);
                    if (s > 0)
                    {
                        travelled[p] += Math.Abs(d - previous[p]);
                    }

                    previous[p] = d;
                }
            }

            for (var p = 0; p < arm.SelfPairs.Length; p++)
            {
                var (ca, cb) = arm.SelfPairs[p];
                var bound = arm.RelativeMotionBoundM(delta, arm.LinkOfCapsule[ca], arm.LinkOfCapsule[cb]);
                Assert.True(travelled[p] <= bound + 1e-9, $"pair {ca}-{cb}: distance changed by {travelled[p]} > bound {bound}");
                if (bound > 1e-6)
                {
                    tightest = Math.Max(tightest, travelled[p] / bound);
                }
            }
        }

        // Not vacuous: some pair's distance changes by a sizeable share of its bound.
        Assert.True(tightest > 0.3, $"tightest ratio {tightest}");
    }
}
