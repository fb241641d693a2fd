using Orchard.Core.Geometry;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Geometry;

/// <summary>
/// Random segment pairs with endpoints drawn from the cube [−1, 1]³ (metres; derived endpoints reach a few metres out,
/// segment lengths stay below about 6 m), biased towards the awkward cases.
/// </summary>
internal static class SegmentPairGenerator
{
    public static readonly int KindCount = Enum.GetValues<SegmentPairKind>().Length;

    public static (Vec3 P1, Vec3 Q1, Vec3 P2, Vec3 Q2) Next(DeterministicRandom rng, SegmentPairKind kind)
    {
        var p1 = Point(rng);
        var q1 = Point(rng);
        var p2 = Point(rng);
        var q2 = Point(rng);
        var d1 = q1 - p1;
        switch (kind)
        {
            case SegmentPairKind.General:
                break;
            case SegmentPairKind.Parallel:
                // Same or opposite direction, any length ratio, offset small enough to overlap often.
                p2 = p1 + (Point(rng) * 0.5);
                q2 = p2 + (d1 * rng.NextDouble(-1.5, 1.5));
                break;
            case SegmentPairKind.Collinear:
                p2 = p1 + (d1 * rng.NextDouble(-2.0, 2.0));
                q2 = p2 + (d1 * rng.NextDouble(-1.5, 1.5));
                break;
            case SegmentPairKind.Crossing:
            {
                // Both segments pass through X (up to rounding).
                var x = Point(rng) * 0.5;
                var d2 = Point(rng);
                var u = rng.NextDouble();
                var v = rng.NextDouble();
                p1 = x - (d1 * u);
                q1 = p1 + d1;
                p2 = x - (d2 * v);
                q2 = p2 + d2;
                break;
            }

            case SegmentPairKind.Touching:
                // Segment 2 starts on segment 1 (an end-to-interior or end-to-end contact).
                p2 = rng.NextBool(0.3) ? q1 : p1 + (d1 * rng.NextDouble());
                break;
            case SegmentPairKind.FirstDegenerate:
                q1 = p1;
                break;
            case SegmentPairKind.SecondDegenerate:
                q2 = p2;
                break;
            case SegmentPairKind.BothDegenerate:
                q1 = p1;
                q2 = p2;
                break;
            case SegmentPairKind.NearlyParallel:
            {
                // Directions differ by an angle of about 1e-10 … 1e-4 rad: the ill-conditioned regime.
                var tilt = Math.Pow(10.0, rng.NextDouble(-10.0, -4.0));
                p2 = p1 + (Point(rng) * (rng.NextBool(0.5) ? 1e-6 : 0.3));
                q2 = p2 + (d1 * rng.NextDouble(-1.5, 1.5)) + (Point(rng) * tilt);
                break;
            }

            case SegmentPairKind.AxisAlignedGrid:
                // Small-integer coordinates on a 0.25 m grid, axis-aligned: exact arithmetic and many ties.
                p1 = GridPoint(rng);
                q1 = AlongAxis(rng, p1);
                p2 = GridPoint(rng);
                q2 = AlongAxis(rng, p2);
                break;
            default:
                throw new ArgumentOutOfRangeException(nameof(kind));
        }

        return (p1, q1, p2, q2);
    }

    public static Vec3 Point(DeterministicRandom rng) =>
        new(rng.NextDouble(-1.0, 1.0), rng.NextDouble(-1.0, 1.0), rng.NextDouble(-1.0, 1.0));

    private static Vec3 GridPoint(DeterministicRandom rng) =>
        new(rng.NextInt(-4, 5) * 0.25, rng.NextInt(-4, 5) * 0.25, rng.NextInt(-4, 5) * 0.25);

    private static Vec3 AlongAxis(DeterministicRandom rng, Vec3 p)
    {
        var step = rng.NextInt(-4, 5) * 0.25;
        return rng.NextInt(3) switch
        {
            0 => p with { X = p.X + step },
            1 => p with { Y = p.Y + step },
            _ => p with { Z = p.Z + step },
        };
    }
}
