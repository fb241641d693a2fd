using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// Closest points between segments and between a point and a segment, after C. Ericson, "Real-Time Collision
/// Detection" (2005): §5.1.9 ClosestPtSegmentSegment and §5.1.2 ClosestPtPointSegment.
/// Pure and allocation-free.
/// </summary>
/// <remarks>
/// Segment 1 is P1 + s·d1 with d1 = Q1 − P1 and segment 2 is P2 + t·d2 with d2 = Q2 − P2, s, t ∈ [0, 1].
/// A segment whose squared length is at most <see cref="DegenerateLengthSquaredM2"/> is treated as the point P.
/// The returned points are always evaluated on the segments from (s, t), so the returned distance is the distance of
/// a real pair of points. For nearly parallel segments s itself is ill-conditioned (any s along the overlap is nearly
/// as good), but the distance is not: see <see cref="Parameters"/> for how the near-parallel case is kept accurate.
/// </remarks>
public static class SegmentClosestPoints
{
    /// <summary>Squared length (m²) at or below which a segment is treated as a point: 1e-18 m², i.e. 1 nm.</summary>
    public const double DegenerateLengthSquaredM2 = 1e-18;

    /// <summary>Closest points between segment P1–Q1 and segment P2–Q2 (Ericson 2005, §5.1.9).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static SegmentPairClosest SegmentSegment(in Vec3 p1, in Vec3 q1, in Vec3 p2, in Vec3 q2)
    {
        Parameters(p1, q1, p2, q2, out var s, out var t);
        var c1 = p1 + ((q1 - p1) * s);
        var c2 = p2 + ((q2 - p2) * t);
        return new SegmentPairClosest(s, t, c1, c2, (c1 - c2).LengthSquared);
    }

    /// <summary>
    /// Squared distance (m²) between segment P1–Q1 and segment P2–Q2; bit-for-bit the
    /// <see cref="SegmentPairClosest.DistanceSquared"/> of <see cref="SegmentSegment"/>.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double SegmentSegmentDistanceSquared(in Vec3 p1, in Vec3 q1, in Vec3 p2, in Vec3 q2)
    {
        Parameters(p1, q1, p2, q2, out var s, out var t);
        var c1 = p1 + ((q1 - p1) * s);
        var c2 = p2 + ((q2 - p2) * t);
        return (c1 - c2).LengthSquared;
    }

    /// <summary>The point of segment A–B closest to <paramref name="point"/> (Ericson 2005, §5.1.2).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static PointSegmentClosest PointSegment(in Vec3 point, in Vec3 a, in Vec3 b)
    {
        var ab = b - a;
        var lengthSquared = ab.LengthSquared;
        var t = lengthSquared <= DegenerateLengthSquaredM2 ? 0.0 : Clamp01(Vec3.Dot(point - a, ab) / lengthSquared);
        var closest = a + (ab * t);
        return new PointSegmentClosest(t, closest, (point - closest).LengthSquared);
    }

    /// <summary>
    /// The (s, t) of Ericson's ClosestPtSegmentSegment. Differences from the printed code: its degeneracy EPSILON is
    /// the named constant above; the line–line numerator and denominator are computed as cross products (the same
    /// numbers in exact arithmetic, see below), so the parallel test is denom &gt; 0 (a squared length).
    /// </summary>
    /// <remarks>
    /// With the printed a e − b², an angle θ between the segments leaves a relative error of about ε / sin²θ in s
    /// (ε = 2^−53), so near sin θ ≈ 1e-8 s is noise and the returned pair overshoots the minimum by about
    /// sin θ · |d1| ≈ 1e-8 |d1| (the NearlyParallel family of the tests, segments up to 6 m, showed 2.5e-8 m).
    /// The cross-product form has error about ε / sin θ in s, i.e. about ε · |r| in the distance (the same family
    /// shows 4e-16 m), for about a dozen more multiplications.
    /// </remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Parameters(in Vec3 p1, in Vec3 q1, in Vec3 p2, in Vec3 q2, out double s, out double t)
    {
        var d1 = q1 - p1;
        var d2 = q2 - p2;
        var r = p1 - p2;
        var a = Vec3.Dot(d1, d1);
        var e = Vec3.Dot(d2, d2);
        var f = Vec3.Dot(d2, r);

        if (a <= DegenerateLengthSquaredM2)
        {
            // Segment 1 is a point: s = 0, then t = f / e clamped (or 0 when both are points).
            s = 0.0;
            t = e <= DegenerateLengthSquaredM2 ? 0.0 : Clamp01(f / e);
            return;
        }

        var c = Vec3.Dot(d1, r);
        if (e <= DegenerateLengthSquaredM2)
        {
            // Segment 2 is a point: t = 0, s = −c / a clamped.
            t = 0.0;
            s = Clamp01(-c / a);
            return;
        }

        var b = Vec3.Dot(d1, d2);

        // Closest point on line 1 to line 2, clamped to segment 1; any s will do for parallel segments.
        // denom = a e − b² and numer = b f − c e, evaluated through Lagrange's identity as |d1 × d2|² and
        // (d1 × d2)·(d2 × r): the same numbers in exact arithmetic, but without the cancellation that loses every
        // digit of a e − b² for nearly parallel segments.
        var n = Vec3.Cross(d1, d2);
        var denom = Vec3.Dot(n, n);
        s = denom > 0.0 ? Clamp01(Vec3.Dot(n, Vec3.Cross(d2, r)) / denom) : 0.0;

        // The point of line 2 closest to P1 + s·d1; if it falls off segment 2, clamp t and recompute s for that t.
        t = ((b * s) + f) / e;
        if (t < 0.0)
        {
            t = 0.0;
            s = Clamp01(-c / a);
        }
        else if (t > 1.0)
        {
            t = 1.0;
            s = Clamp01((b - c) / a);
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double Clamp01(double x) => x < 0.0 ? 0.0 : (x > 1.0 ? 1.0 : x);
}
