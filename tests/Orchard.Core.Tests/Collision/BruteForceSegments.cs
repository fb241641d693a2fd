using Orchard.Core.Geometry;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// Segment–segment distance by enumerating the candidates of the minimum, a method unrelated to the clamping sequence
/// of <see cref="SegmentClosestPoints"/>. f(s, t) = |P1 + s·d1 − P2 − t·d2|² is a convex quadratic on the square
/// [0, 1]², so its minimum is either interior, where both partial derivatives vanish (the closest points of the two
/// lines, unique unless the segments are parallel), or on an edge of the square, where s or t is 0 or 1 and the rest
/// is the distance from an endpoint to the other segment. The smallest of those (up to) five candidates is the
/// distance; each candidate is the distance of a real pair of points, so none undercuts it. Plain doubles throughout.
/// </summary>
internal static class BruteForceSegments
{
    public static double DistanceSquared(in Vec3 p1, in Vec3 q1, in Vec3 p2, in Vec3 q2)
    {
        double d1x = q1.X - p1.X, d1y = q1.Y - p1.Y, d1z = q1.Z - p1.Z;
        double d2x = q2.X - p2.X, d2y = q2.Y - p2.Y, d2z = q2.Z - p2.Z;
        var best = PointSegment(p1.X, p1.Y, p1.Z, p2.X, p2.Y, p2.Z, d2x, d2y, d2z);
        best = Math.Min(best, PointSegment(q1.X, q1.Y, q1.Z, p2.X, p2.Y, p2.Z, d2x, d2y, d2z));
        best = Math.Min(best, PointSegment(p2.X, p2.Y, p2.Z, p1.X, p1.Y, p1.Z, d1x, d1y, d1z));
        best = Math.Min(best, PointSegment(q2.X, q2.Y, q2.Z, p1.X, p1.Y, p1.Z, d1x, d1y, d1z));

        // Interior candidate: with r = P2 − P1 and n = d1 × d2, s·d1 − t·d2 − r is parallel to n at the line–line
        // minimum; crossing with d2 (resp. d1) and dotting with n gives s = ((r × d2)·n)/|n|², t = ((r × d1)·n)/|n|².
        double nx = (d1y * d2z) - (d1z * d2y), ny = (d1z * d2x) - (d1x * d2z), nz = (d1x * d2y) - (d1y * d2x);
        var nn = (nx * nx) + (ny * ny) + (nz * nz);
        if (nn > 0)
        {
            double rx = p2.X - p1.X, ry = p2.Y - p1.Y, rz = p2.Z - p1.Z;
            var s = ((((ry * d2z) - (rz * d2y)) * nx) + (((rz * d2x) - (rx * d2z)) * ny) + (((rx * d2y) - (ry * d2x)) * nz)) / nn;
            var t = ((((ry * d1z) - (rz * d1y)) * nx) + (((rz * d1x) - (rx * d1z)) * ny) + (((rx * d1y) - (ry * d1x)) * nz)) / nn;
            if (s is >= 0 and <= 1 && t is >= 0 and <= 1)
            {
                var ex = p1.X + (s * d1x) - p2.X - (t * d2x);
                var ey = p1.Y + (s * d1y) - p2.Y - (t * d2y);
                var ez = p1.Z + (s * d1z) - p2.Z - (t * d2z);
                best = Math.Min(best, (ex * ex) + (ey * ey) + (ez * ez));
            }
        }

        return best;
    }

    /// <summary>Signed capsule distance: core distance minus both radii.</summary>
    public static double SignedDistance(in Capsule a, in Capsule b) =>
        Math.Sqrt(DistanceSquared(a.A, a.B, b.A, b.B)) - a.RadiusM - b.RadiusM;

    /// <summary>Squared distance from point x to the segment a + u·d, u ∈ [0, 1] (a point when d = 0).</summary>
    private static double PointSegment(double xx, double xy, double xz, double ax, double ay, double az, double dx, double dy, double dz)
    {
        var dd = (dx * dx) + (dy * dy) + (dz * dz);
        var u = dd > 0 ? Math.Clamp((((xx - ax) * dx) + ((xy - ay) * dy) + ((xz - az) * dz)) / dd, 0, 1) : 0;
        var ex = ax + (u * dx) - xx;
        var ey = ay + (u * dy) - xy;
        var ez = az + (u * dz) - xz;
        return (ex * ex) + (ey * ey) + (ez * ez);
    }
}
