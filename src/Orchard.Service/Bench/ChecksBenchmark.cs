using System.Diagnostics;
using Orchard.Core.Collision;
using Orchard.Core.Demo;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;

namespace Orchard.Service.Bench;

/// <summary>
/// Configuration checks per second and inverse-kinematics solves per second on the demo arm at a demo
/// tree, one thread, as medians of several timed runs after a warm-up. Configurations are drawn half
/// uniformly within the joint limits and half near the wood (IK to points on branches), so both
/// colliding and free answers are timed.
/// </summary>
internal static class ChecksBenchmark
{
    /// <summary>Edges timed per run: between neighbouring sampled configurations.</summary>
    private const int EdgesPerRun = 2000;

    /// <summary>Seconds each phase runs untimed first.</summary>
    private const double WarmUpS = 1.5;

    public sealed record Result(
        double ChecksPerSecond,
        double IkSolvesPerSecond,
        double EdgeChecksPerSecond,
        double FreeShare,
        int Runs,
        int ChecksPerRun,
        int IkSolvesPerRun,
        string TreeId,
        int SceneCapsules,
        IReadOnlyList<double> ChecksPerSecondRuns,
        IReadOnlyList<double> IkSolvesPerSecondRuns,
        MachineInfo Machine);

    public static Result Run(int runs, int checksPerRun, int ikPerRun, CancellationToken cancellationToken)
    {
        var tree = DemoOrchard.Generate().Trees[0].Scan;
        var arm = DemoArm.Create();
        var cell = new WorkCell(tree, arm);
        var checker = cell.CreateChecker();
        var random = new DeterministicRandom(2026);
        var n = cell.Chain.JointCount;
        var configurations = SampleConfigurations(cell, random, 4096);

        var free = 0L;
        var total = 0L;
        var checkRates = Rates(runs, () =>
        {
            var watch = Stopwatch.StartNew();
            for (var i = 0; i < checksPerRun; i++)
            {
                if (checker.IsFree(configurations[i & 4095]))
                {
                    free++;
                }
            }

            watch.Stop();
            total += checksPerRun;
            return checksPerRun / watch.Elapsed.TotalSeconds;
        }, cancellationToken);

        // Edges between neighbouring samples: conservative advancement, the planner's edge check.
        var edgeRates = Rates(runs, () =>
        {
            var watch = Stopwatch.StartNew();
            for (var i = 0; i + 1 < EdgesPerRun; i++)
            {
                checker.IsEdgeFree(configurations[i], configurations[i + 1]);
            }

            watch.Stop();
            return (EdgesPerRun - 1) / watch.Elapsed.TotalSeconds;
        }, cancellationToken);

        // IK: reachable poses (the tool pose of random configurations), solved from the stow configuration.
        var ik = new InverseKinematics(cell.Chain, new InverseKinematicsSettings(RandomSeedCount: 4, MaxSolutions: 1));
        var targets = Enumerable.Range(0, 512).Select(_ => cell.Chain.ToolPose(RandomWithinLimits(cell.Chain, random))).ToArray();
        var stow = arm.StowConfiguration.ToArray();
        var ikRun = 0UL;
        var ikRates = Rates(runs, () =>
        {
            var ikRandom = new DeterministicRandom(++ikRun + 10);
            var watch = Stopwatch.StartNew();
            for (var i = 0; i < ikPerRun; i++)
            {
                ik.Solve(targets[i & 511], stow, ikRandom, cancellationToken);
            }

            watch.Stop();
            return ikPerRun / watch.Elapsed.TotalSeconds;
        }, cancellationToken);

        _ = n;
        return new Result(
            BenchStatistics.Median(checkRates),
            BenchStatistics.Median(ikRates),
            BenchStatistics.Median(edgeRates),
            (double)free / total,
            runs,
            checksPerRun,
            ikPerRun,
            tree.TreeId,
            cell.Scene.Capsules.Count,
            checkRates,
            ikRates,
            MachineInfo.Current());
    }

    /// <summary>
    /// Timed runs after a warm-up of at least <see cref="WarmUpS"/>: the runtime compiles a hot method's optimised
    /// form only after it has been called for a while (tiered compilation), and a phase shorter than that would time
    /// the quick first form (edge checks measured 2.7× slower so).
    /// </summary>
    private static List<double> Rates(int runs, Func<double> timedRun, CancellationToken cancellationToken)
    {
        var warm = Stopwatch.StartNew();
        while (warm.Elapsed.TotalSeconds < WarmUpS)
        {
            cancellationToken.ThrowIfCancellationRequested();
            timedRun();
        }

        var rates = new List<double>(runs);
        for (var run = 0; run < runs; run++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            rates.Add(timedRun());
        }

        return rates;
    }

    private static double[][] SampleConfigurations(WorkCell cell, DeterministicRandom random, int count)
    {
        var ik = new InverseKinematics(cell.Chain, new InverseKinematicsSettings(RandomSeedCount: 2, MaxSolutions: 1));
        var wood = cell.Scene.Capsules.Where((_, i) => cell.Scene.Kinds[i] == SceneCapsuleKind.Wood).ToArray();
        var result = new double[count][];
        for (var i = 0; i < count; i++)
        {
            var q = RandomWithinLimits(cell.Chain, random);
            if (i % 2 == 1)
            {
                // Aim the TCP at a random point on the wood, keeping the random orientation.
                var c = wood[random.NextInt(wood.Length)];
                var target = new Pose3(cell.Chain.ToolPose(q).Rotation, Vec3.Lerp(c.A, c.B, random.NextDouble()));
                var solved = ik.Solve(target, q, random);
                if (solved.Found)
                {
                    q = solved.Solutions[0].Joints.ToArray();
                }
            }

            result[i] = q;
        }

        return result;
    }

    private static double[] RandomWithinLimits(KinematicChain chain, DeterministicRandom random)
    {
        var q = new double[chain.JointCount];
        for (var j = 0; j < q.Length; j++)
        {
            q[j] = random.NextDouble(chain.LowerLimits[j], chain.UpperLimits[j]);
        }

        return q;
    }
}
