using Orchard.Core.Geometry;
using Orchard.Core.Randomness;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Geometry;

/// <summary>
/// <see cref="CapsuleBvh"/> against a brute-force loop over every scene capsule, which is the definition of both
/// queries: the results must be identical, not merely close.
/// </summary>
public sealed class CapsuleBvhTests(ITestOutputHelper output)
{
    private const int SceneSize = 2000;
    private const int QueryCount = 10_000;

    /// <summary>Queries for which the sphere-filtered reference is itself checked against the plain loop.</summary>
    private const int UnfilteredChecks = 100;

    [Fact]
    public void AnyOverlap_equals_brute_force_on_random_queries()
    {
        var rng = new DeterministicRandom(1001);
        var (scene, groups) = OrchardLikeScene(rng, SceneSize);
        var bvh = new CapsuleBvh(scene, groups);
        var reference = new SceneBruteForce(scene, groups);
        var stats = default(BvhQueryStats);
        var overlaps = 0;
        var changedByIgnoring = 0;
        for (var i = 0; i < QueryCount; i++)
        {
            var (query, nearGroup) = RandomQuery(rng, scene, groups);
            var margin = RandomMargin(rng);
            var ignore = RandomIgnoreGroup(rng, nearGroup, groups);

            var expected = reference.AnyOverlap(query, margin, ignore);
            if (i < UnfilteredChecks)
            {
                Assert.Equal(reference.AnyOverlapUnfiltered(query, margin, ignore), expected);
            }

            var actual = bvh.AnyOverlap(query, margin, ignore, ref stats, out var hit);

            Assert.True(expected == actual, $"query {i}: brute force {expected}, BVH {actual}");
            Assert.Equal(actual, bvh.AnyOverlap(query, margin, ignore));
            if (actual)
            {
                Assert.True(CapsuleDistance.Overlaps(query, scene[hit], margin));
                Assert.NotEqual(ignore, groups[hit]);
                overlaps++;
            }
            else
            {
                Assert.Equal(-1, hit);
            }

            if (ignore != CapsuleBvh.NoGroup && actual != bvh.AnyOverlap(query, margin))
            {
                changedByIgnoring++;
            }
        }

        output.WriteLine($"overlaps {overlaps}/{QueryCount}, changed by ignoring {changedByIgnoring}, {stats}, brute force pair tests {(long)QueryCount * SceneSize}");

        // The queries exercise both outcomes and the group filter in bulk, and the tree prunes: under 5 % of the
        // brute-force pair tests (a regression bound, not a timing).
        Assert.InRange(overlaps, QueryCount / 10, QueryCount - (QueryCount / 10));
        Assert.True(changedByIgnoring > QueryCount / 50, $"ignoring a group changed only {changedByIgnoring} answers");
        Assert.Equal(QueryCount, stats.Queries);
        Assert.True(stats.PairTests < (long)QueryCount * SceneSize / 20, stats.ToString());
    }

    [Fact]
    public void NearestSignedDistance_equals_brute_force_on_random_queries()
    {
        var rng = new DeterministicRandom(2002);
        var (scene, groups) = OrchardLikeScene(rng, SceneSize);
        var bvh = new CapsuleBvh(scene, groups);
        var reference = new SceneBruteForce(scene, groups);
        var stats = default(BvhQueryStats);
        var penetrating = 0;
        var capped = 0;
        for (var i = 0; i < QueryCount; i++)
        {
            var (query, nearGroup) = RandomQuery(rng, scene, groups);
            var maxDistance = rng.NextInt(4) switch
            {
                0 => double.PositiveInfinity,
                1 => 0.5,
                2 => 0.05,
                _ => -0.01,
            };
            var ignore = RandomIgnoreGroup(rng, nearGroup, groups);

            var expected = reference.Nearest(query, maxDistance, ignore);
            if (i < UnfilteredChecks)
            {
                Assert.Equal(reference.NearestUnfiltered(query, maxDistance, ignore), expected);
            }

            var actual = bvh.NearestSignedDistance(query, maxDistance, ignore, ref stats, out var nearest);

            Assert.True(
                BitConverter.DoubleToInt64Bits(expected) == BitConverter.DoubleToInt64Bits(actual),
                $"query {i}: brute force {expected:R}, BVH {actual:R}");
            Assert.Equal(actual, bvh.NearestSignedDistance(query, maxDistance, ignore));
            if (nearest >= 0)
            {
                Assert.Equal(actual, CapsuleDistance.SignedDistance(query, scene[nearest]));
                Assert.NotEqual(ignore, groups[nearest]);
                Assert.True(actual < maxDistance);
            }
            else
            {
                Assert.Equal(maxDistance, actual);
                capped++;
            }

            penetrating += actual < 0 ? 1 : 0;
        }

        output.WriteLine($"penetrating {penetrating}, capped at max {capped}, {stats}, brute force pair tests {(long)QueryCount * SceneSize}");
        Assert.InRange(penetrating, QueryCount / 20, QueryCount - (QueryCount / 20));
        Assert.InRange(capped, QueryCount / 20, QueryCount - (QueryCount / 20));
        Assert.True(stats.PairTests < (long)QueryCount * SceneSize / 20, stats.ToString());
    }

    [Fact]
    public void A_large_scene_builds_a_balanced_tree_and_still_matches_brute_force()
    {
        const int Large = 20_000;
        var rng = new DeterministicRandom(3003);
        var (scene, groups) = OrchardLikeScene(rng, Large);
        var bvh = new CapsuleBvh(scene, groups);
        var reference = new SceneBruteForce(scene, groups);

        // Median splits halve the count per level: leaves of ≤ 4 after ⌈log2(20000 / 4)⌉ = 13 splits, so depth ≤ 14.
        Assert.Equal(Large, bvh.Count);
        Assert.InRange(bvh.Depth, 1, 14);
        Assert.InRange(bvh.NodeCount, 1, (2 * Large) - 1);

        for (var i = 0; i < 500; i++)
        {
            var (query, nearGroup) = RandomQuery(rng, scene, groups);
            var ignore = RandomIgnoreGroup(rng, nearGroup, groups);
            Assert.Equal(reference.AnyOverlap(query, 0.02, ignore), bvh.AnyOverlap(query, 0.02, ignore));
            Assert.Equal(
                reference.Nearest(query, double.PositiveInfinity, ignore),
                bvh.NearestSignedDistance(query, double.PositiveInfinity, ignore));
        }
    }

    [Fact]
    public void Coincident_capsules_build_and_query_correctly()
    {
        // 1000 copies of one capsule: every centroid ties, the split must still halve by position.
        var scene = Enumerable.Repeat(new Capsule(new(0, 0, 0), new(1, 0, 0), 0.1), 1000).ToArray();
        var groups = Enumerable.Range(0, 1000).Select(i => i % 2).ToArray();
        var bvh = new CapsuleBvh(scene, groups);

        Assert.InRange(bvh.Depth, 1, 10);
        var touching = new Capsule(new(0.5, 0.3, 0), new(0.5, 1, 0), 0.2);
        Assert.True(bvh.AnyOverlap(touching, 0.0));
        Assert.Equal(0.0, bvh.NearestSignedDistance(touching, 1.0), 1e-15);
        Assert.Equal(0.0, bvh.NearestSignedDistance(touching, 1.0, ignoreGroup: 0), 1e-15);
        Assert.False(bvh.AnyOverlap(touching, -0.001));
    }

    [Fact]
    public void Empty_and_single_capsule_scenes()
    {
        var query = new Capsule(new(0, 0, 0), new(0, 0, 1), 0.1);
        var empty = new CapsuleBvh([]);
        Assert.Equal(0, empty.NodeCount);
        Assert.False(empty.AnyOverlap(query, 10.0));
        Assert.Equal(3.0, empty.NearestSignedDistance(query, 3.0));
        Assert.True(empty.Bounds.IsEmpty);

        // One sphere at (1, 0, 0.5), radius 0.4: 1 − 0.1 − 0.4 = 0.5 from the query (hand-derived).
        var single = new CapsuleBvh([new Capsule(new(1, 0, 0.5), new(1, 0, 0.5), 0.4)], [7]);
        var stats = default(BvhQueryStats);
        Assert.Equal(0.5, single.NearestSignedDistance(query, 2.0, CapsuleBvh.NoGroup, ref stats, out var nearest));
        Assert.Equal(0, nearest);
        Assert.Equal(2.0, single.NearestSignedDistance(query, 2.0, ignoreGroup: 7));
        Assert.Equal(0.25, single.NearestSignedDistance(query, 0.25));
        Assert.False(single.AnyOverlap(query, 0.25));
        Assert.True(single.AnyOverlap(query, 0.5));
        Assert.False(single.AnyOverlap(query, 0.5, ignoreGroup: 7));
        Assert.Equal(1, stats.Queries);
        Assert.Equal(1, stats.PairTests);
    }

    [Fact]
    public void Exact_contact_survives_the_single_precision_node_boxes()
    {
        // The tree stores boxes in float, rounded outwards. Scene sphere at x = 1 + 2^-28, radius 1/2, so its box ends
        // at 1.5 + 2^-28, which a float cannot hold (nearest float: 1.5, since 2^-28 is below half a float step near
        // 1.5, 2^-24) and which lies 3.7e-9 m beyond 1.5, more than the 1e-9 m prune slack. Query sphere at
        // x = 2 + 2^-28, radius 1/2: centres exactly 1 apart, so they touch (signed distance exactly 0, hand-derived).
        // A box rounded to nearest instead of outwards would prune this contact.
        var offset = Math.ScaleB(1.0, -28);
        var scene = new Capsule(new(1 + offset, 0, 0), new(1 + offset, 0, 0), 0.5);
        var query = new Capsule(new(2 + offset, 0, 0), new(2 + offset, 0, 0), 0.5);
        Assert.Equal(0.0, CapsuleDistance.SignedDistance(query, scene));

        // Pad with far-away capsules so the contact sits in a leaf below inner nodes.
        var capsules = new List<Capsule> { scene };
        for (var i = 0; i < 63; i++)
        {
            capsules.Add(new Capsule(new(-10 - i, 5, 0), new(-10 - i, 6, 0), 0.1));
        }

        var bvh = new CapsuleBvh(capsules.ToArray());
        Assert.True(bvh.AnyOverlap(query, 0.0));
        Assert.Equal(0.0, bvh.NearestSignedDistance(query, 1e-9));
    }

    [Fact]
    public void Construction_rejects_bad_input()
    {
        var capsule = new Capsule(new(0, 0, 0), new(1, 0, 0), 0.1);
        Assert.Throws<ArgumentException>(() => new CapsuleBvh([capsule, capsule], [0]));
        Assert.Throws<ArgumentException>(() => new CapsuleBvh([capsule], [-1]));
        Assert.Throws<ArgumentException>(() => new CapsuleBvh([capsule with { RadiusM = -0.1 }]));
        Assert.Throws<ArgumentException>(() => new CapsuleBvh([capsule with { B = new Vec3(double.NaN, 0, 0) }]));
    }

    /// <summary>
    /// A row of trees in a 4 × 1.5 × 3.5 m box: branches as chains of touching capsules (one group per branch),
    /// horizontal trellis wires and vertical posts (one group each).
    /// </summary>
    private static (Capsule[] Capsules, int[] Groups) OrchardLikeScene(DeterministicRandom rng, int count)
    {
        var capsules = new List<Capsule>(count);
        var groups = new List<int>(count);
        var group = 0;
        for (var wire = 0; wire < 4 && capsules.Count < count; wire++)
        {
            var z = 0.6 + (0.7 * wire);
            capsules.Add(new Capsule(new(-0.2, 0.75, z), new(4.2, 0.75, z), 0.002));
            groups.Add(group++);
        }

        for (var post = 0; post < 3 && capsules.Count < count; post++)
        {
            capsules.Add(new Capsule(new(2.0 * post, 0.75, 0), new(2.0 * post, 0.75, 3.2), 0.05));
            groups.Add(group++);
        }

        while (capsules.Count < count)
        {
            // A branch: a random walk of 3 … 12 pieces, thinning towards the tip.
            var start = new Vec3(rng.NextDouble(0, 4), rng.NextDouble(0.3, 1.2), rng.NextDouble(0.3, 3.3));
            var direction = RandomUnit(rng);
            var radius = rng.NextDouble(0.01, 0.04);
            var pieces = rng.NextInt(3, 13);
            for (var k = 0; k < pieces && capsules.Count < count; k++)
            {
                direction = (direction + (RandomUnit(rng) * 0.5)).Normalized();
                var end = start + (direction * rng.NextDouble(0.05, 0.3));
                capsules.Add(new Capsule(start, end, radius));
                groups.Add(group);
                start = end;
                radius = Math.Max(0.003, radius * 0.85);
            }

            group++;
        }

        return (capsules.ToArray(), groups.ToArray());
    }

    /// <summary>
    /// An arm-link-like capsule (10 % spheres): half of them start near a random scene capsule (so contacts and the
    /// group filter matter), the rest anywhere in or slightly around the scene box. Also returns the group of the
    /// scene capsule it was placed near (or a random existing group).
    /// </summary>
    private static (Capsule Query, int NearGroup) RandomQuery(DeterministicRandom rng, Capsule[] scene, int[] groups)
    {
        Vec3 a;
        int nearGroup;
        if (rng.NextBool(0.5))
        {
            var k = rng.NextInt(scene.Length);
            a = Vec3.Lerp(scene[k].A, scene[k].B, rng.NextDouble()) + (RandomUnit(rng) * rng.NextDouble(0.0, 0.12));
            nearGroup = groups[k];
        }
        else
        {
            a = new Vec3(rng.NextDouble(-0.3, 4.3), rng.NextDouble(-0.3, 1.8), rng.NextDouble(-0.3, 3.8));
            nearGroup = groups[rng.NextInt(groups.Length)];
        }

        var length = rng.NextBool(0.1) ? 0.0 : rng.NextDouble(0.02, 0.6);
        return (new Capsule(a, a + (RandomUnit(rng) * length), rng.NextDouble(0.005, 0.08)), nearGroup);
    }

    private static double RandomMargin(DeterministicRandom rng) => rng.NextInt(5) switch
    {
        0 => 0.0,
        1 => 0.01,
        2 => 0.05,
        3 => -0.005,
        _ => rng.NextDouble(0, 0.1),
    };

    /// <summary>A third of queries ignore nothing, a third the group they were placed near, a third a random group number (which may not exist).</summary>
    private static int RandomIgnoreGroup(DeterministicRandom rng, int nearGroup, int[] groups) => rng.NextInt(3) switch
    {
        0 => CapsuleBvh.NoGroup,
        1 => nearGroup,
        _ => rng.NextInt(groups[^1] + 10),
    };

    private static Vec3 RandomUnit(DeterministicRandom rng)
    {
        while (true)
        {
            var v = new Vec3(rng.NextDouble(-1, 1), rng.NextDouble(-1, 1), rng.NextDouble(-1, 1));
            var lengthSquared = v.LengthSquared;
            if (lengthSquared is > 1e-6 and <= 1.0)
            {
                return v / Math.Sqrt(lengthSquared);
            }
        }
    }
}
