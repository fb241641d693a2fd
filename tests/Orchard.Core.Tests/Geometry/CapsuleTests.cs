using Orchard.Core.Geometry;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Geometry;

/// <summary><see cref="Capsule"/> helpers. Worked values are hand-derived (shown).</summary>
public sealed class CapsuleTests
{
    [Fact]
    public void Bounds_are_the_segment_box_grown_by_the_radius()
    {
        // Segment box [0,2]×[−1,0]×[3,3] grown by 0.5.
        var c = new Capsule(new(0, 0, 3), new(2, -1, 3), 0.5);

        Assert.Equal(new Aabb(new(-0.5, -1.5, 2.5), new(2.5, 0.5, 3.5)), c.Bounds);
    }

    [Fact]
    public void Bounds_contain_random_surface_points()
    {
        var rng = new DeterministicRandom(11);
        for (var i = 0; i < 500; i++)
        {
            var c = new Capsule(SegmentPairGenerator.Point(rng), SegmentPairGenerator.Point(rng), rng.NextDouble(0, 0.3));
            var onAxis = Vec3.Lerp(c.A, c.B, rng.NextDouble());
            var direction = SegmentPairGenerator.Point(rng).Normalized();
            var surface = onAxis + (direction * c.RadiusM * (1 - 1e-12));

            Assert.True(c.Bounds.Contains(surface));
        }
    }

    [Fact]
    public void Transformed_moves_the_endpoints_rigidly_and_keeps_distances()
    {
        // A quarter turn about z maps (1,0,0) to (0,1,0); then translate by (10, 0, 0).
        var pose = new Pose3(Rot3.AxisAngle(Vec3.UnitZ, Math.PI / 2), new Vec3(10, 0, 0));
        var c = new Capsule(new(1, 0, 0), new(2, 0, 1), 0.25);

        var moved = c.Transformed(pose);

        AssertClose(new Vec3(10, 1, 0), moved.A);
        AssertClose(new Vec3(10, 2, 1), moved.B);
        Assert.Equal(0.25, moved.RadiusM);

        var rng = new DeterministicRandom(12);
        var general = new Pose3(Rot3.FromRpy(0.3, -1.1, 2.0), new Vec3(0.5, -2, 7));
        for (var i = 0; i < 200; i++)
        {
            var a = new Capsule(SegmentPairGenerator.Point(rng), SegmentPairGenerator.Point(rng), 0.1);
            var b = new Capsule(SegmentPairGenerator.Point(rng), SegmentPairGenerator.Point(rng), 0.2);
            Assert.Equal(
                CapsuleDistance.SignedDistance(a, b),
                CapsuleDistance.SignedDistance(a.Transformed(general), b.Transformed(general)),
                1e-12);
        }
    }

    private static void AssertClose(Vec3 expected, Vec3 actual)
    {
        Assert.Equal(expected.X, actual.X, 1e-12);
        Assert.Equal(expected.Y, actual.Y, 1e-12);
        Assert.Equal(expected.Z, actual.Z, 1e-12);
    }
}
