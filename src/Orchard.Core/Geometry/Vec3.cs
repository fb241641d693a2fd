using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>A 3-vector of doubles (metres where it is a point). Hot math: a readonly struct, no allocation.</summary>
public readonly record struct Vec3(double X, double Y, double Z)
{
    public static Vec3 Zero => default;

    public static Vec3 UnitX => new(1, 0, 0);

    public static Vec3 UnitY => new(0, 1, 0);

    public static Vec3 UnitZ => new(0, 0, 1);

    public double Length => Math.Sqrt(LengthSquared);

    public double LengthSquared => (X * X) + (Y * Y) + (Z * Z);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator +(in Vec3 a, in Vec3 b) => new(a.X + b.X, a.Y + b.Y, a.Z + b.Z);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator -(in Vec3 a, in Vec3 b) => new(a.X - b.X, a.Y - b.Y, a.Z - b.Z);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator -(in Vec3 a) => new(-a.X, -a.Y, -a.Z);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator *(in Vec3 a, double s) => new(a.X * s, a.Y * s, a.Z * s);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator *(double s, in Vec3 a) => new(a.X * s, a.Y * s, a.Z * s);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator /(in Vec3 a, double s) => new(a.X / s, a.Y / s, a.Z / s);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Dot(in Vec3 a, in Vec3 b) => (a.X * b.X) + (a.Y * b.Y) + (a.Z * b.Z);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 Cross(in Vec3 a, in Vec3 b) =>
        new((a.Y * b.Z) - (a.Z * b.Y), (a.Z * b.X) - (a.X * b.Z), (a.X * b.Y) - (a.Y * b.X));

    public static double Distance(in Vec3 a, in Vec3 b) => (a - b).Length;

    /// <summary>Component-wise minimum.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 Min(in Vec3 a, in Vec3 b) => new(Math.Min(a.X, b.X), Math.Min(a.Y, b.Y), Math.Min(a.Z, b.Z));

    /// <summary>Component-wise maximum.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 Max(in Vec3 a, in Vec3 b) => new(Math.Max(a.X, b.X), Math.Max(a.Y, b.Y), Math.Max(a.Z, b.Z));

    public static Vec3 Lerp(in Vec3 a, in Vec3 b, double t) => a + ((b - a) * t);

    /// <summary>The unit vector along this one; the zero vector stays zero.</summary>
    public Vec3 Normalized()
    {
        var length = Length;
        return length > 0 ? this / length : Zero;
    }

    public bool IsFinite => double.IsFinite(X) && double.IsFinite(Y) && double.IsFinite(Z);
}
