using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Timing;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// Every trajectory of every demo schedule (three seeds), read the way a controller reads it: sampled at
/// 1 kHz by the documented interpolation (<see cref="KnotContract"/>). Positions within the joint limits and
/// free of collision (in the scene each move was planned for; on the final approach the shear may touch the
/// limb being cut), velocities and accelerations within the limits, and the knots consistent with the
/// interpolation (positions and velocities continuous at every knot) to 1e-9.
/// </summary>
[Collection(DemoOrchardSchedules.Collection)]
public sealed class TrajectoryContractTests(DemoOrchardSchedules orchard, ITestOutputHelper output)
{
    private const double SampleSeconds = 0.001;
    private const double Tolerance = 1e-9;

    [Fact]
    public void Every_trajectory_sampled_at_1_kHz_stays_within_the_limits_free_and_continuous()
    {
        var arm = orchard.Arm;
        var limits = JointSpeedLimits.From(arm);
        var lower = arm.Joints.Select(j => j.LowerLimit).ToArray();
        var upper = arm.Joints.Select(j => j.UpperLimit).ToArray();
        long samples = 0;
        var trajectories = 0;
        var problems = new List<string>();
        foreach (var tree in orchard.Trees)
        {
            var recheck = new ScheduleRecheck(tree.Scan, arm);
            foreach (var stop in tree.Schedule.Stops)
            {
                var pieces = new List<(string Name, IReadOnlyList<TrajectoryPoint> Knots, CollisionChecker Checker, Func<double, int> Group)>();
                foreach (var step in stop.Steps)
                {
                    pieces.Add(($"step {step.Sequence} travel", step.Travel, recheck.CheckerFor(stop, step.DependsOnCuts), _ => -1));
                    var limb = recheck.LimbOf(stop, step.CutId);
                    pieces.Add(($"step {step.Sequence} approach", step.Approach, recheck.CheckerFor(stop, []), t => t >= step.PreCutSecond ? limb : -1));
                    var retract = KnotContract.Reversed(step.Approach);
                    var back = step.ApproachSeconds - step.PreCutSecond;
                    pieces.Add(($"step {step.Sequence} retract", retract, recheck.CheckerFor(stop, []), t => t <= back ? limb : -1));
                }

                pieces.Add(("return to stow", stop.ReturnToStow, recheck.CheckerFor(stop, stop.ReturnDependsOnCuts), _ => -1));
                foreach (var (name, knots, checker, group) in pieces)
                {
                    trajectories++;
                    var what = $"{tree} stop {stop.Sequence} {name}";
                    var residual = KnotContract.LargestResidual(knots);
                    if (residual > Tolerance)
                    {
                        problems.Add($"{what}: knots stray {residual:E2} from the interpolation");
                    }

                    samples += Sample(knots, checker, group, limits, lower, upper, what, problems);
                }
            }
        }

        output.WriteLine($"{trajectories:N0} trajectories, {samples:N0} samples at 1 kHz, {problems.Count} problems");
        Assert.Empty(problems.Take(20));
        Assert.True(samples > 1_000_000);
    }

    [Fact]
    public void Consecutive_trajectories_join_exactly()
    {
        foreach (var tree in orchard.Trees)
        {
            foreach (var stop in tree.Schedule.Stops)
            {
                var at = stop.StartConfiguration;
                foreach (var step in stop.Steps)
                {
                    Assert.Equal(at, step.Travel[0].Positions);
                    Assert.Equal(step.Travel[^1].Positions, step.Approach[0].Positions);
                    Assert.All(new[] { step.Travel[0], step.Travel[^1], step.Approach[0], step.Approach[^1] }, k => Assert.All(k.Velocities, v => Assert.Equal(0, v)));
                    at = step.Approach[0].Positions;
                }

                Assert.Equal(at, stop.ReturnToStow[0].Positions);
            }
        }
    }

    private static long Sample(IReadOnlyList<TrajectoryPoint> knots, CollisionChecker checker, Func<double, int> group, JointSpeedLimits limits, double[] lower, double[] upper, string what, List<string> problems)
    {
        var n = lower.Length;
        var (q, v, a) = (new double[n], new double[n], new double[n]);
        var end = knots[^1].TimeS;
        var count = (long)Math.Floor(end / SampleSeconds) + 1;
        for (var i = 0L; i <= count; i++)
        {
            var t = Math.Min(end, i * SampleSeconds);
            KnotContract.Sample(knots, t, q, v, a);
            for (var j = 0; j < n; j++)
            {
                if (q[j] < lower[j] - Tolerance || q[j] > upper[j] + Tolerance)
                {
                    problems.Add($"{what} at {t:F3} s: joint {j} at {q[j]:G6} outside [{lower[j]}, {upper[j]}]");
                    return i;
                }

                if (Math.Abs(v[j]) > limits.MaxVelocity[j] * (1 + 1e-9) + Tolerance || Math.Abs(a[j]) > limits.MaxAcceleration[j] * (1 + 1e-9) + Tolerance)
                {
                    problems.Add($"{what} at {t:F3} s: joint {j} velocity {v[j]:G6} or acceleration {a[j]:G6} above its limit");
                    return i;
                }
            }

            if (!checker.IsFree(q, group(t)))
            {
                problems.Add($"{what} at {t:F3} s: not free ({checker.Check(q, group(t))})");
                return i;
            }
        }

        return count;
    }
}
