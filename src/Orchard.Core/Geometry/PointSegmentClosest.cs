namespace Orchard.Core.Geometry;

/// <summary>
/// The point of segment A + t·(B − A), t ∈ [0, 1], closest to a query point, and its squared distance (m²).
/// </summary>
public readonly record struct PointSegmentClosest(double T, Vec3 Point, double DistanceSquared)
{
    public double Distance => Math.Sqrt(DistanceSquared);
}
