using Orchard.Core.Demo;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Kinematics;

public sealed class InverseKinematicsTests(ITestOutputHelper output)
{
    private static readonly KinematicChain DemoChain = new(DemoArm.Create());

    [Fact]
    public void Round_trip_on_1000_random_reachable_demo_poses_converges_at_least_99_percent()
    {
        // Each target is the TCP pose of a random configuration q within the limits, so it is reachable. The
        // seeds are the stow configuration and random configurations from another stream, each at least 0.5
        // (joint units) from q, so the answer is never handed in. Stopping at two solutions a pose keeps the
        // test short without changing whether a pose converges (seeds are tried until the first success).
        const int poses = 1000;
        var chain = DemoChain;
        var n = chain.JointCount;
        var settings = InverseKinematicsSettings.Default with { RandomSeedCount = 0, MaxSolutions = 2 };
        var solver = new InverseKinematics(chain, settings);
        var stow = DemoArm.Create().StowConfiguration.ToArray();
        var targets = new DeterministicRandom(1000);
        var seedSource = new DeterministicRandom(2000);
        const int seedsPerPose = 6;
        var seeds = new double[seedsPerPose * n];
        var converged = 0;
        var solutions = 0;
        var iterations = 0;
        for (var k = 0; k < poses; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(targets, chain.LowerLimits, chain.UpperLimits);
            var target = chain.ToolPose(q);
            for (var s = 0; s < seedsPerPose; s++)
            {
                var seed = seeds.AsSpan(s * n, n);
                do
                {
                    if (s == 0)
                    {
                        stow.CopyTo(seed);
                    }
                    else
                    {
                        KinematicsAssert.RandomConfiguration(seedSource, chain.LowerLimits, chain.UpperLimits).CopyTo(seed);
                    }
                }
                while (s > 0 && Distance(seed, q) < 0.5);
            }

            var result = solver.Solve(target, seeds, new DeterministicRandom((ulong)k));
            iterations += result.Statistics.Iterations;
            if (result.Found)
            {
                converged++;
            }

            foreach (var solution in result.Solutions)
            {
                solutions++;
                var joints = solution.Joints.ToArray();
                Assert.True(chain.WithinLimits(joints), $"pose {k}: solution outside the limits.");
                var (position, angle) = KinematicsAssert.PoseDistance(target, chain.ToolPose(joints));
                Assert.True(position <= 1e-4 && angle <= 1e-3, $"pose {k}: FK of the solution is {position:E2} m, {angle:E2} rad off.");
                Assert.Equal(position, solution.PositionErrorM, 1e-12);
                Assert.Equal(angle, solution.OrientationErrorRad, 1e-12);
            }
        }

        output.WriteLine($"converged {converged}/{poses}, {solutions} solutions, {iterations} iterations in all");
        Assert.True(converged >= 990, $"Only {converged} of {poses} poses converged.");
    }

    [Fact]
    public void Returns_several_distinct_solutions_pairwise_farther_than_the_threshold()
    {
        // A cut pose in front of the arm: TCP 0.9 m out along x at 1.2 m height, approach along +x.
        var chain = DemoChain;
        var solver = new InverseKinematics(chain, InverseKinematicsSettings.Default with { RandomSeedCount = 12 });
        var target = new Pose3(Rot3.FromColumns(new Vec3(0, 0, -1), new Vec3(0, 1, 0), new Vec3(1, 0, 0)), new Vec3(0.9, 0.1, 1.2));
        var result = solver.Solve(target, DemoArm.Create().StowConfiguration.ToArray(), new DeterministicRandom(42));

        Assert.True(result.Solutions.Count >= 2, $"Only {result.Solutions.Count} solution(s).");
        Assert.True(result.Statistics.SeedsConverged >= result.Solutions.Count);
        for (var i = 0; i < result.Solutions.Count; i++)
        {
            var a = result.Solutions[i].Joints.ToArray();
            var (position, angle) = KinematicsAssert.PoseDistance(target, chain.ToolPose(a));
            Assert.True(position <= 1e-4 && angle <= 1e-3);
            Assert.True(chain.WithinLimits(a));
            for (var j = i + 1; j < result.Solutions.Count; j++)
            {
                Assert.True(Distance(a, result.Solutions[j].Joints.ToArray()) > solver.Settings.DistinctnessThreshold, $"solutions {i} and {j} are too close.");
            }

            if (i > 0)
            {
                Assert.True(result.Solutions[i - 1].DistanceToFirstSeed <= result.Solutions[i].DistanceToFirstSeed, "not sorted by distance to the first seed.");
            }
        }

        output.WriteLine($"{result.Solutions.Count} distinct solutions from {result.Statistics.SeedsTried} seeds");
    }

    [Fact]
    public void Finds_both_wrist_flips_of_a_pose()
    {
        // With the spherical wrist (roll, pitch, roll), (q₄, q₅, q₆) and (q₄ ± π, −q₅, q₆ ± π) give the same
        // tool pose; seeded at each, the solver must keep both as distinct solutions.
        var chain = DemoChain;
        double[] q = [0.6, 0.3, 0.5, 0.8, 0.4, 0.9, 0.2];
        double[] flipped = [0.6, 0.3, 0.5, 0.8, 0.4 - Math.PI, -0.9, 0.2 - Math.PI];
        var target = chain.ToolPose(q);
        var (position, angle) = KinematicsAssert.PoseDistance(target, chain.ToolPose(flipped));
        Assert.True(position < 1e-12 && angle < 1e-12, "the flip is not the same pose; the test is wrong.");

        // Seeds near each flip, not at it.
        double[] seeds = [.. q.Select(v => v + 0.05), .. flipped.Select(v => v - 0.05)];
        var solver = new InverseKinematics(chain, InverseKinematicsSettings.Default with { RandomSeedCount = 0 });
        var result = solver.Solve(target, seeds, new DeterministicRandom(1));
        Assert.Equal(2, result.Solutions.Count);
        Assert.Equal(0, result.Solutions[0].SeedIndex);
        Assert.True(Distance(result.Solutions[0].Joints.ToArray(), q) < 0.2);
        Assert.True(Distance(result.Solutions[1].Joints.ToArray(), flipped) < 0.2);
    }

    [Fact]
    public void A_roll_with_180_degree_limits_wraps_past_pi_instead_of_stopping_at_the_limit()
    {
        // The demo arm with its lift held at 0.5 m: six revolute joints, no redundancy left. The target needs the
        // flange roll at +3.1 rad; the seed has it at −3.1 rad, 0.08 rad away through ±π. Clamped at −π the
        // other five joints cannot make up the last bit of roll; wrapped by 2π (the same pose) it is one short step.
        var profile = DemoArm.Create();
        profile = profile with { Joints = [profile.Joints[0] with { LowerLimit = 0.5, UpperLimit = 0.5 }, .. profile.Joints.Skip(1)] };
        var chain = new KinematicChain(profile);
        var solver = new InverseKinematics(chain);
        double[] q = [0.5, 0.3, 0.4, 1.0, 0.5, 0.6, 3.1];
        double[] seed = [0.5, 0.3, 0.4, 1.0, 0.5, 0.6, -3.1];
        var solution = new double[7];
        var attempt = solver.SolveFromSeed(chain.ToolPose(q), seed, solution);
        Assert.True(attempt.Converged, attempt.ToString());
        Assert.True(attempt.Iterations <= 5, attempt.ToString());
        Assert.True(chain.WithinLimits(solution));
        Assert.Equal(3.1, solution[6], 0.01);
    }

    [Fact]
    public void Same_random_seed_gives_the_same_result()
    {
        var solver = new InverseKinematics(DemoChain);
        var target = DemoChain.ToolPose([0.4, -0.3, 0.6, 1.1, 0.2, -0.7, 0.5]);
        var first = solver.Solve(target, new DeterministicRandom(9));
        var second = solver.Solve(target, new DeterministicRandom(9));
        Assert.True(first.Found);
        Assert.Equal(first.Statistics, second.Statistics);
        Assert.Equal(first.Solutions.Count, second.Solutions.Count);
        for (var i = 0; i < first.Solutions.Count; i++)
        {
            Assert.Equal(first.Solutions[i].Joints, second.Solutions[i].Joints);
        }
    }

    [Fact]
    public void Unreachable_target_returns_no_solution_and_tries_every_seed()
    {
        // 5 m up is beyond the lift (1.8 m) plus the arm (1.68 m at full stretch).
        var solver = new InverseKinematics(DemoChain, InverseKinematicsSettings.Default with { RandomSeedCount = 3 });
        var result = solver.Solve(new Pose3(Rot3.Identity, new Vec3(0, 0, 5)), DemoArm.Create().StowConfiguration.ToArray(), new DeterministicRandom(5));
        Assert.False(result.Found);
        Assert.Equal(4, result.Statistics.SeedsTried);
        Assert.Equal(0, result.Statistics.SeedsConverged);
    }

    [Fact]
    public void Max_solutions_and_cancellation_stop_early()
    {
        var target = DemoChain.ToolPose([0.4, -0.3, 0.6, 1.1, 0.2, -0.7, 0.5]);
        var one = new InverseKinematics(DemoChain, InverseKinematicsSettings.Default with { MaxSolutions = 1 }).Solve(target, new DeterministicRandom(3));
        Assert.Single(one.Solutions);
        Assert.Equal(one.Solutions[0].SeedIndex + 1, one.Statistics.SeedsTried);

        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        var none = new InverseKinematics(DemoChain).Solve(target, new DeterministicRandom(3), cancelled.Token);
        Assert.False(none.Found);
        Assert.Equal(0, none.Statistics.SeedsTried);
        Assert.True(none.Statistics.Cancelled);
    }

    [Fact]
    public void Solve_from_seed_clamps_into_the_limits_and_reports_failure_honestly()
    {
        var solver = new InverseKinematics(DemoChain, InverseKinematicsSettings.Default with { MaxIterations = 1 });
        var target = DemoChain.ToolPose([1.0, 1.0, 0.5, 1.0, 0.5, 1.0, 0.5]);
        double[] seed = [-5, -5, -5, -5, -5, -5, -5];
        var solution = new double[7];
        var attempt = solver.SolveFromSeed(target, seed, solution);
        Assert.True(DemoChain.WithinLimits(solution));
        Assert.False(attempt.Converged);
        Assert.Equal(1, attempt.Iterations);
        var (position, angle) = KinematicsAssert.PoseDistance(target, DemoChain.ToolPose(solution));
        Assert.Equal(position, attempt.PositionErrorM, 1e-12);
        Assert.Equal(angle, attempt.OrientationErrorRad, 1e-12);
    }

    [Fact]
    public void Fixed_damping_also_converges_near_a_solution()
    {
        // Plain damped least squares (no Levenberg–Marquardt adaptation) from a nearby seed.
        var solver = new InverseKinematics(DemoChain, InverseKinematicsSettings.Default with { AdaptiveDamping = false, Damping = 0.01, RandomSeedCount = 0 });
        double[] q = [0.5, 0.2, 0.4, 0.9, 0.3, 0.8, -0.2];
        var result = solver.Solve(DemoChain.ToolPose(q), q.Select(v => v + 0.1).ToArray(), new DeterministicRandom(1));
        Assert.True(result.Found);
    }

    [Fact]
    public void Settings_out_of_range_are_rejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new InverseKinematics(DemoChain, new InverseKinematicsSettings(MaxIterations: 0)));
        Assert.Throws<ArgumentOutOfRangeException>(() => new InverseKinematics(DemoChain, new InverseKinematicsSettings(Damping: -1)));
        Assert.Throws<ArgumentOutOfRangeException>(() => new InverseKinematics(DemoChain, new InverseKinematicsSettings(DampingIncrease: 1)));
        Assert.Throws<ArgumentOutOfRangeException>(() => new InverseKinematics(DemoChain, new InverseKinematicsSettings(MinDamping: 1, MaxDamping: 0.1)));
        Assert.Throws<ArgumentOutOfRangeException>(() => new InverseKinematics(DemoChain, new InverseKinematicsSettings(MaxSolutions: 0)));
        Assert.Throws<ArgumentException>(() => new InverseKinematics(DemoChain).Solve(Pose3.Identity, new double[5], new DeterministicRandom(1)));
    }

    private static double Distance(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var sum = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            sum += (a[i] - b[i]) * (a[i] - b[i]);
        }

        return Math.Sqrt(sum);
    }
}
