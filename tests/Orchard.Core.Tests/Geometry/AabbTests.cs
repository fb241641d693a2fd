using Orchard.Core.Geometry;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Geometry;

/// <summary><see cref="Aabb"/>. Worked values are hand-derived (shown); coordinates are small integers, so exact.</summary>
public sealed class AabbTests
{
    private static readonly Aabb UnitCube = new(new(0, 0, 0), new(1, 1, 1));

    [Fact]
    public void Distance_between_separated_boxes_combines_the_per_axis_gaps()
    {
        // [0,1]³ and [2,3]×[0,1]×[3,4]: gaps 1 (x), 0 (y, overlapping), 2 (z): distance² = 1 + 4 = 5.
        var other = new Aabb(new(2, 0, 3), new(3, 1, 4));

        Assert.Equal(5.0, Aabb.DistanceSquared(UnitCube, other));
        Assert.Equal(5.0, Aabb.DistanceSquared(other, UnitCube));
        Assert.Equal(Math.Sqrt(5.0), Aabb.Distance(UnitCube, other));
        Assert.False(Aabb.Overlaps(UnitCube, other));
    }

    [Fact]
    public void Overlapping_and_touching_boxes_are_zero_apart_and_overlap()
    {
        var overlapping = new Aabb(new(0.5, 0.5, 0.5), new(2, 2, 2));
        var touching = new Aabb(new(1, 0, 0), new(2, 1, 1));

        Assert.Equal(0.0, Aabb.DistanceSquared(UnitCube, overlapping));
        Assert.True(Aabb.Overlaps(UnitCube, overlapping));
        Assert.Equal(0.0, Aabb.DistanceSquared(UnitCube, touching));
        Assert.True(Aabb.Overlaps(UnitCube, touching));
    }

    [Fact]
    public void Union_expand_and_empty_behave_as_documented()
    {
        var other = new Aabb(new(-1, 2, 0.5), new(0, 3, 0.75));

        Assert.Equal(new Aabb(new(-1, 0, 0), new(1, 3, 1)), Aabb.Union(UnitCube, other));
        Assert.Equal(UnitCube, Aabb.Union(Aabb.Empty, UnitCube));
        Assert.True(Aabb.Empty.IsEmpty);
        Assert.False(UnitCube.IsEmpty);
        Assert.False(Aabb.Overlaps(Aabb.Empty, UnitCube));
        Assert.Equal(new Aabb(new(-0.5, -0.5, -0.5), new(1.5, 1.5, 1.5)), UnitCube.Expanded(0.5));
        Assert.Equal(new Aabb(new(0, -1, 2), new(3, 5, 2)), Aabb.FromPoints(new(3, -1, 2), new(0, 5, 2)));
        Assert.Equal(new Vec3(0.5, 0.5, 0.5), UnitCube.Center);
        Assert.True(UnitCube.Contains(new(1, 0, 0.5)));
        Assert.False(UnitCube.Contains(new(1.0625, 0, 0.5)));
    }

    [Fact]
    public void Box_distance_is_a_lower_bound_on_the_distance_between_points_inside()
    {
        var rng = new DeterministicRandom(3);
        for (var i = 0; i < 2000; i++)
        {
            var a = Aabb.FromPoints(SegmentPairGenerator.Point(rng), SegmentPairGenerator.Point(rng));
            var b = Aabb.FromPoints(SegmentPairGenerator.Point(rng) * 2, SegmentPairGenerator.Point(rng) * 2);
            var p = Inside(rng, a);
            var q = Inside(rng, b);

            Assert.True(Aabb.DistanceSquared(a, b) <= (p - q).LengthSquared * (1 + 1e-12));
            Assert.Equal(Aabb.DistanceSquared(a, b) == 0.0, Aabb.Overlaps(a, b));
        }
    }

    private static Vec3 Inside(DeterministicRandom rng, in Aabb box) => new(
        rng.NextDouble(box.Min.X, box.Max.X), rng.NextDouble(box.Min.Y, box.Max.Y), rng.NextDouble(box.Min.Z, box.Max.Z));
}
