using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// Distance between capsules: the distance between their core segments minus both radii. Positive is the clearance
/// (m) between the surfaces; negative means the capsules interpenetrate, by at most that much along the line joining
/// the closest core points.
/// </summary>
public static class CapsuleDistance
{
    /// <summary>Signed distance (m) between capsules <paramref name="a"/> and <paramref name="b"/>: |core distance| − rA − rB.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double SignedDistance(in Capsule a, in Capsule b) =>
        SignedFromSegmentDistanceSquared(
            SegmentClosestPoints.SegmentSegmentDistanceSquared(a.A, a.B, b.A, b.B), a.RadiusM, b.RadiusM);

    /// <summary>Closest points between the core segments of two capsules (the surfaces lie a radius inward along the joining line).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static SegmentPairClosest ClosestCorePoints(in Capsule a, in Capsule b) =>
        SegmentClosestPoints.SegmentSegment(a.A, a.B, b.A, b.B);

    /// <summary>
    /// True when the capsules are within <paramref name="marginM"/> of each other, i.e. core distance ≤ rA + rB + margin
    /// (touching counts; a negative margin tolerates that much penetration). Compares squares: no square root.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Overlaps(in Capsule a, in Capsule b, double marginM)
    {
        var reach = a.RadiusM + b.RadiusM + marginM;
        if (!(reach >= 0.0))
        {
            return false;
        }

        return SegmentClosestPoints.SegmentSegmentDistanceSquared(a.A, a.B, b.A, b.B) <= reach * reach;
    }

    /// <summary>The one formula for the signed distance, shared with <see cref="CapsuleBvh"/> so both agree bit for bit.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static double SignedFromSegmentDistanceSquared(double segmentDistanceSquared, double radiusAM, double radiusBM) =>
        Math.Sqrt(segmentDistanceSquared) - radiusAM - radiusBM;
}
