using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// An axis-aligned box [<see cref="Min"/>, <see cref="Max"/>] in metres. <see cref="Empty"/> (min = +∞, max = −∞) is
/// the identity of <see cref="Union(in Aabb, in Aabb)"/> and overlaps nothing.
/// </summary>
public readonly record struct Aabb(Vec3 Min, Vec3 Max)
{
    public static Aabb Empty => new(
        new Vec3(double.PositiveInfinity, double.PositiveInfinity, double.PositiveInfinity),
        new Vec3(double.NegativeInfinity, double.NegativeInfinity, double.NegativeInfinity));

    /// <summary>True when the box contains no point (some min above its max).</summary>
    public bool IsEmpty => !(Min.X <= Max.X && Min.Y <= Max.Y && Min.Z <= Max.Z);

    public Vec3 Center => (Min + Max) * 0.5;

    /// <summary>Edge lengths along x, y, z.</summary>
    public Vec3 Size => Max - Min;

    /// <summary>The smallest box containing both points.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Aabb FromPoints(in Vec3 a, in Vec3 b) => new(Vec3.Min(a, b), Vec3.Max(a, b));

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Aabb Union(in Aabb a, in Aabb b) => new(Vec3.Min(a.Min, b.Min), Vec3.Max(a.Max, b.Max));

    /// <summary>This box grown by <paramref name="marginM"/> on every side (a negative margin shrinks it).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Aabb Expanded(double marginM) =>
        new(new Vec3(Min.X - marginM, Min.Y - marginM, Min.Z - marginM), new Vec3(Max.X + marginM, Max.Y + marginM, Max.Z + marginM));

    public bool Contains(in Vec3 p) =>
        p.X >= Min.X && p.X <= Max.X && p.Y >= Min.Y && p.Y <= Max.Y && p.Z >= Min.Z && p.Z <= Max.Z;

    /// <summary>True when the closed boxes share at least one point (touching counts).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Overlaps(in Aabb a, in Aabb b) =>

        // Non-short-circuit '&': one unpredictable branch on the result instead of up to six.
        (a.Min.X <= b.Max.X) & (b.Min.X <= a.Max.X) &
        (a.Min.Y <= b.Max.Y) & (b.Min.Y <= a.Max.Y) &
        (a.Min.Z <= b.Max.Z) & (b.Min.Z <= a.Max.Z);

    /// <summary>
    /// Squared Euclidean distance between the closest points of two non-empty boxes; 0 when they overlap. It is a
    /// lower bound on the squared distance between any point of <paramref name="a"/> and any point of <paramref name="b"/>.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double DistanceSquared(in Aabb a, in Aabb b)
    {
        var dx = Math.Max(0.0, Math.Max(a.Min.X - b.Max.X, b.Min.X - a.Max.X));
        var dy = Math.Max(0.0, Math.Max(a.Min.Y - b.Max.Y, b.Min.Y - a.Max.Y));
        var dz = Math.Max(0.0, Math.Max(a.Min.Z - b.Max.Z, b.Min.Z - a.Max.Z));
        return (dx * dx) + (dy * dy) + (dz * dz);
    }

    /// <summary>Euclidean distance between two non-empty boxes; 0 when they overlap.</summary>
    public static double Distance(in Aabb a, in Aabb b) => Math.Sqrt(DistanceSquared(a, b));
}
