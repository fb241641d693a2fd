using Orchard.Core.Geometry;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Geometry;

/// <summary>
/// <see cref="CapsuleDistance"/>. Expected values in the worked cases are hand-derived (shown beside each) from the
/// definition signed distance = core segment distance − rA − rB; coordinates and radii are dyadic, so exact.
/// </summary>
public sealed class CapsuleDistanceTests
{
    [Fact]
    public void Parallel_capsules_whose_axes_are_the_sum_of_radii_apart_touch_exactly()
    {
        // Axes along x at y = 0 and y = 0.75; radii 0.5 + 0.25 = 0.75: distance 0.75 − 0.75 = 0.
        var a = new Capsule(new(0, 0, 0), new(1, 0, 0), 0.5);
        var b = new Capsule(new(0, 0.75, 0), new(1, 0.75, 0), 0.25);

        Assert.Equal(0.0, CapsuleDistance.SignedDistance(a, b));
        Assert.True(CapsuleDistance.Overlaps(a, b, 0.0));
        Assert.False(CapsuleDistance.Overlaps(a, b, -1.0 / 1024));
        Assert.True(CapsuleDistance.Overlaps(a, b, 1.0 / 1024));
    }

    [Fact]
    public void Crossed_capsules_touching_at_the_surfaces_have_distance_zero()
    {
        // Perpendicular axes one apart in z (the worked segment case), radii 0.25 + 0.75 = 1: distance 1 − 1 = 0.
        var a = new Capsule(new(-1, 0, 0), new(1, 0, 0), 0.25);
        var b = new Capsule(new(0, -1, 1), new(0, 1, 1), 0.75);

        Assert.Equal(0.0, CapsuleDistance.SignedDistance(a, b));
        Assert.True(CapsuleDistance.Overlaps(a, b, 0.0));
    }

    [Fact]
    public void Penetrating_capsules_have_negative_distance()
    {
        // Axes 0.75 apart, radii 0.5 + 0.5: 0.75 − 1 = −0.25.
        var a = new Capsule(new(0, 0, 0), new(1, 0, 0), 0.5);
        var b = new Capsule(new(0, 0.75, 0), new(1, 0.75, 0), 0.5);
        Assert.Equal(-0.25, CapsuleDistance.SignedDistance(a, b));
        Assert.True(CapsuleDistance.Overlaps(a, b, 0.0));
        Assert.True(CapsuleDistance.Overlaps(a, b, -0.25));
        Assert.False(CapsuleDistance.Overlaps(a, b, -0.375));

        // Axes that cross: 0 − 0.125 − 0.25 = −0.375, the deepest a pair with these radii can be.
        var c = new Capsule(new(-1, 0, 0), new(1, 0, 0), 0.125);
        var d = new Capsule(new(0, -1, 0), new(0, 1, 0), 0.25);
        Assert.Equal(-0.375, CapsuleDistance.SignedDistance(c, d));
    }

    [Fact]
    public void Separated_spheres_are_centre_distance_minus_radii_apart()
    {
        // Zero-length cores: centres differ by (3, 4, 0), 5 apart; radii 1 and 2: 5 − 3 = 2.
        var a = new Capsule(new(1, 2, 3), new(1, 2, 3), 1.0);
        var b = new Capsule(new(4, 6, 3), new(4, 6, 3), 2.0);

        Assert.Equal(2.0, CapsuleDistance.SignedDistance(a, b));
        Assert.False(CapsuleDistance.Overlaps(a, b, 1.75));
        Assert.True(CapsuleDistance.Overlaps(a, b, 2.0));
    }

    [Fact]
    public void Closest_core_points_are_the_segment_closest_points()
    {
        var a = new Capsule(new(0, 0, 0), new(1, 0, 0), 0.1);
        var b = new Capsule(new(2, -1, 1), new(2, 1, 1), 0.2);

        Assert.Equal(
            SegmentClosestPoints.SegmentSegment(a.A, a.B, b.A, b.B),
            CapsuleDistance.ClosestCorePoints(a, b));
    }

    /// <summary>
    /// 1,000 random capsule pairs (segment families of <see cref="SegmentPairGenerator"/>, radii 0 … 0.5 m).
    /// Reference: brute-force core distance minus the radii; tolerance 1e-10 m as justified in
    /// <see cref="SegmentClosestPointsTests.Random_pairs_match_brute_force_and_are_self_consistent"/>.
    /// Overlaps must equal "signed distance ≤ margin" except within 1e-12 m of the boundary, where the two roundings
    /// (square vs square root) may disagree.
    /// </summary>
    [Fact]
    public void Random_capsules_match_brute_force_and_overlap_agrees_with_the_sign()
    {
        const int Pairs = 1_000;
        const double ToleranceM = 1e-10;
        var rng = new DeterministicRandom(77);
        var overlapping = 0;
        for (var i = 0; i < Pairs; i++)
        {
            var kind = (SegmentPairKind)(i % SegmentPairGenerator.KindCount);
            var (p1, q1, p2, q2) = SegmentPairGenerator.Next(rng, kind);
            var a = new Capsule(p1, q1, rng.NextDouble(0.0, 0.5));
            var b = new Capsule(p2, q2, rng.NextDouble(0.0, 0.5));

            var signed = CapsuleDistance.SignedDistance(a, b);
            var reference = Math.Sqrt(BruteForceDistance.SegmentSegmentDistanceSquared(p1, q1, p2, q2)) - a.RadiusM - b.RadiusM;
            Assert.True(Math.Abs(signed - reference) <= ToleranceM, $"pair {i} ({kind}): {signed:R} vs brute force {reference:R}");
            Assert.Equal(signed, CapsuleDistance.SignedDistance(b, a), ToleranceM);

            var margin = rng.NextDouble(-0.2, 0.2);
            var overlaps = CapsuleDistance.Overlaps(a, b, margin);
            if (Math.Abs(signed - margin) > 1e-12)
            {
                Assert.Equal(signed <= margin, overlaps);
            }

            overlapping += overlaps ? 1 : 0;
        }

        // Both outcomes are exercised in bulk.
        Assert.InRange(overlapping, Pairs / 10, Pairs - (Pairs / 10));
    }

    /// <summary>
    /// 200 random separated pairs: the points a radius out from the closest core points, along the joining line, lie
    /// on each capsule's surface (which holds only if each core point is the closest point of its segment to the
    /// other, i.e. the pair is optimal) and are the signed distance apart.
    /// </summary>
    [Fact]
    public void Separated_capsules_realise_their_distance_with_surface_points()
    {
        var rng = new DeterministicRandom(5);
        var checkedPairs = 0;
        while (checkedPairs < 200)
        {
            var a = new Capsule(SegmentPairGenerator.Point(rng), SegmentPairGenerator.Point(rng), rng.NextDouble(0.0, 0.3));
            var b = new Capsule(SegmentPairGenerator.Point(rng) + new Vec3(1.5, 0, 0), SegmentPairGenerator.Point(rng) + new Vec3(1.5, 0, 0), rng.NextDouble(0.0, 0.3));
            var signed = CapsuleDistance.SignedDistance(a, b);
            if (signed <= 1e-3)
            {
                continue;
            }

            var core = CapsuleDistance.ClosestCorePoints(a, b);
            var direction = (core.PointOnSecond - core.PointOnFirst).Normalized();
            var onA = core.PointOnFirst + (direction * a.RadiusM);
            var onB = core.PointOnSecond - (direction * b.RadiusM);

            Assert.Equal(a.RadiusM, SegmentClosestPoints.PointSegment(onA, a.A, a.B).Distance, 1e-12);
            Assert.Equal(b.RadiusM, SegmentClosestPoints.PointSegment(onB, b.A, b.B).Distance, 1e-12);
            Assert.Equal(signed, Vec3.Distance(onA, onB), 1e-12);
            checkedPairs++;
        }
    }
}
