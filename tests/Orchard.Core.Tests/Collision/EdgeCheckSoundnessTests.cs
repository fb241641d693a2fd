using System.Diagnostics;
using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// Conservative advancement is sound: an edge IsEdgeFree calls free has no colliding configuration on it. Edges of
/// six kinds between free configurations of a demo tree (the one with a post), short and long, by the wood and in the
/// open, some with a limb ignored for the tool as on a cut's approach, some turning one joint alone.
/// <para>
/// Sizes: a Debug build spends ~50 µs on one IsFree and ~150 µs on one advancement step, so re-checking each of the
/// ~1,300 free edges among 2,000 at 2,001 samples takes minutes. By default 180 edges are checked, the 18 free ones
/// that pass closest to something (the most advancement steps) are re-checked at 2,001 samples and the other free
/// ones at 33; with ORCHARD_SOAK=1, 2,000 edges and every free one at 2,001 samples.
/// </para>
/// </summary>
public sealed class EdgeCheckSoundnessTests(ITestOutputHelper output)
{
    private static readonly string[] KindNames =
    [
        "short by the wood, its limb ignored",
        "short by the wood",
        "short in the open",
        "long, branch to branch",
        "long, anywhere",
        "one joint turned, by the wood",
    ];

    private const int DenseIntervals = 2000;
    private const int CoarseIntervals = 32;

    /// <summary>Edges checked; at full size, the specification's 2,000.</summary>
    private static readonly int EdgeCount = Soak.Size(180, 2000);

    /// <summary>Free edges re-checked at 2,001 samples, the tightest first; at full size, every free edge.</summary>
    private static readonly int DenseEdges = Soak.Size(18, int.MaxValue);

    [Fact]
    public void An_edge_IsEdgeFree_calls_free_is_free_at_every_sample_of_a_dense_recheck()
    {
        var cell = CollisionTestCells.Cell(CollisionTestCells.TreeWithPost);
        var checker = cell.CreateChecker();
        var chain = cell.Chain;
        var random = new DeterministicRandom(0xED6E5);
        var pool = FreeConfigurationPool.Create(cell, checker, random, uniformCount: 200, nearWoodBases: 50);
        var clock = Stopwatch.StartNew();
        var edges = new List<Edge>(EdgeCount);
        while (edges.Count < EdgeCount)
        {
            var kind = edges.Count % KindNames.Length;
            double[] from;
            double[] to;
            var group = CapsuleBvh.NoGroup;
            switch (kind)
            {
                case 0 or 1:
                    // Short moves by the wood, every other one with the shear allowed on its limb (a cut's approach).
                    (from, var limb) = pool.NearWood[random.NextInt(pool.NearWood.Count)];
                    to = JointSpace.Step(random, chain, from, random.NextDouble(0.02, 0.3));
                    group = kind == 0 ? limb : CapsuleBvh.NoGroup;
                    break;
                case 2:
                    from = pool.Uniform[random.NextInt(pool.Uniform.Count)];
                    to = JointSpace.Step(random, chain, from, random.NextDouble(0.05, 0.6));
                    break;
                case 3:
                    // Long moves from one branch to another.
                    from = pool.NearWood[random.NextInt(pool.NearWood.Count)].Q;
                    to = pool.NearWood[random.NextInt(pool.NearWood.Count)].Q;
                    break;
                case 4:
                    from = pool.Uniform[random.NextInt(pool.Uniform.Count)];
                    to = random.NextBool(0.5) ? pool.Uniform[random.NextInt(pool.Uniform.Count)] : pool.NearWood[random.NextInt(pool.NearWood.Count)].Q;
                    break;
                default:
                    // One joint alone: far points then move at nearly the motion bound, so a step longer than the
                    // bound allows would overshoot.
                    from = pool.NearWood[random.NextInt(pool.NearWood.Count)].Q;
                    to = JointSpace.TurnOneJoint(random, chain, from, random.NextDouble(0.1, 1.2));
                    break;
            }

            if (!checker.IsFree(to, group))
            {
                continue;
            }

            var before = checker.ClearanceEvaluations;
            var free = checker.IsEdgeFree(from, to, group);
            edges.Add(new Edge(from, to, group, free, checker.ClearanceEvaluations - before, kind));
        }

        var edgeSeconds = clock.Elapsed.TotalSeconds;
        clock.Restart();
        var freeEdges = edges.Where(e => e.Free).ToList();
        var collidingEdges = edges.Where(e => !e.Free).ToList();

        // The free edges that pass closest to something (the most advancement steps) get the dense re-check.
        var dense = freeEdges.OrderByDescending(e => e.Steps).Take(DenseEdges).ToList();
        foreach (var edge in dense)
        {
            var hit = FirstCollidingSample(checker, edge, DenseIntervals);
            Assert.True(hit < 0, $"IsEdgeFree said free, but sample {hit}/{DenseIntervals} collides ({edge.Steps} steps, group {edge.Group}).");
        }

        var denseSeconds = clock.Elapsed.TotalSeconds;
        clock.Restart();
        foreach (var edge in freeEdges.Except(dense))
        {
            var hit = FirstCollidingSample(checker, edge, CoarseIntervals);
            Assert.True(hit < 0, $"IsEdgeFree said free, but sample {hit}/{CoarseIntervals} collides ({edge.Steps} steps).");
        }

        var coarseSeconds = clock.Elapsed.TotalSeconds;
        var refusedWithSampledContact = collidingEdges.Count(e => FirstCollidingSample(checker, e, CoarseIntervals) >= 0);
        output.WriteLine($"{edges.Count} edges: {freeEdges.Count} free, {collidingEdges.Count} colliding ({refusedWithSampledContact} with a colliding sample among {CoarseIntervals + 1})");
        foreach (var group in edges.GroupBy(e => e.Kind).OrderBy(g => g.Key))
        {
            output.WriteLine($"  {KindNames[group.Key]}: {group.Count(e => e.Free)} free, {group.Count(e => !e.Free)} colliding, steps mean {group.Average(e => e.Steps):F1} max {group.Max(e => e.Steps)}");
        }

        output.WriteLine($"dense re-check of {dense.Count} free edges ({dense.Min(e => e.Steps)}..{dense.Max(e => e.Steps)} steps) at {DenseIntervals + 1} samples, the other {freeEdges.Count - dense.Count} at {CoarseIntervals + 1}");
        output.WriteLine($"time: edges {edgeSeconds:F1} s, dense {denseSeconds:F1} s, coarse {coarseSeconds:F1} s");
        Assert.True(freeEdges.Count >= EdgeCount / 5 && collidingEdges.Count >= EdgeCount / 5, "both outcomes should be common");
    }

    /// <summary>The index of the first sample found colliding among i/intervals, i = 0..intervals (coarse to fine), or −1.</summary>
    private static int FirstCollidingSample(CollisionChecker checker, Edge edge, int intervals)
    {
        var q = new double[edge.From.Length];
        foreach (var i in CoarseToFine(intervals))
        {
            var t = (double)i / intervals;
            for (var j = 0; j < q.Length; j++)
            {
                q[j] = edge.From[j] + (t * (edge.To[j] - edge.From[j]));
            }

            if (!checker.IsFree(q, edge.Group))
            {
                return i;
            }
        }

        return -1;
    }

    /// <summary>
    /// 0..n, each once: the ends first, then the odd multiples of ever smaller powers of two (coarse to fine), so a
    /// colliding stretch is met early. Every i in 1..n−1 is s × odd for exactly one power of two s.
    /// </summary>
    private static IEnumerable<int> CoarseToFine(int n)
    {
        yield return 0;
        yield return n;
        var top = 1;
        while (top * 2 <= n)
        {
            top *= 2;
        }

        for (var s = top; s >= 1; s /= 2)
        {
            for (var i = s; i < n; i += 2 * s)
            {
                yield return i;
            }
        }
    }

    private sealed record Edge(double[] From, double[] To, int Group, bool Free, long Steps, int Kind);
}
