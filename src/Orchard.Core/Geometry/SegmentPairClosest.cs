namespace Orchard.Core.Geometry;

/// <summary>
/// Closest points between segment 1 (P1 + s·(Q1 − P1)) and segment 2 (P2 + t·(Q2 − P2)), s, t ∈ [0, 1].
/// <see cref="DistanceSquared"/> is |<see cref="PointOnFirst"/> − <see cref="PointOnSecond"/>|² (m²).
/// </summary>
public readonly record struct SegmentPairClosest(double S, double T, Vec3 PointOnFirst, Vec3 PointOnSecond, double DistanceSquared)
{
    public double Distance => Math.Sqrt(DistanceSquared);
}
