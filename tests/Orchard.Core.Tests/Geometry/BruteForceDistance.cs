using Orchard.Core.Geometry;

namespace Orchard.Core.Tests.Geometry;

/// <summary>
/// Reference distances computed without the closed-form solution under test: dense sampling of the parameter square
/// plus nested golden-section search.
/// </summary>
/// <remarks>
/// f(s, t) = |P1 + s·d1 − P2 − t·d2|² is a convex quadratic on [0, 1]² (it is |affine map|²). Minimising a jointly
/// convex function over one variable leaves a convex function of the other (Boyd and Vandenberghe, "Convex
/// Optimization", 2004, §3.2.5, partial minimisation — section number recalled from memory), so g(s) = min_t f(s, t)
/// is convex on [0, 1] and golden-section search on g, with golden-section search on t inside, brackets a minimiser
/// (for a convex function, f(x1) ≤ f(x2) with x1 &lt; x2 implies a minimiser in [a, x2], even on flat stretches).
/// Every value returned is f at a real parameter pair, so the result never undercuts the true minimum (beyond
/// rounding); the grid is an independent upper bound kept in the minimum in case the search went astray.
/// </remarks>
internal static class BruteForceDistance
{
    private const int GridSteps = 16;

    /// <summary>0.618^56 ≈ 2e-12: each bracket ends within that of a minimiser.</summary>
    private const int GoldenIterations = 56;

    private static readonly double InvPhi = (Math.Sqrt(5.0) - 1.0) / 2.0;

    /// <summary>Squared distance between segment P1–Q1 and P2–Q2 by sampling plus nested golden-section search.</summary>
    public static double SegmentSegmentDistanceSquared(Vec3 p1, Vec3 q1, Vec3 p2, Vec3 q2)
    {
        var f = new Objective(p1, q1 - p1, p2, q2 - p2);

        var best = double.PositiveInfinity;
        for (var i = 0; i <= GridSteps; i++)
        {
            for (var j = 0; j <= GridSteps; j++)
            {
                best = Math.Min(best, f.At((double)i / GridSteps, (double)j / GridSteps));
            }
        }

        // Outer golden-section over s; each evaluation is itself a golden-section minimum over t.
        double a = 0, b = 1;
        var x1 = b - (InvPhi * (b - a));
        var x2 = a + (InvPhi * (b - a));
        var g1 = f.MinOverT(x1);
        var g2 = f.MinOverT(x2);
        for (var k = 0; k < GoldenIterations; k++)
        {
            if (g1 <= g2)
            {
                b = x2;
                x2 = x1;
                g2 = g1;
                x1 = b - (InvPhi * (b - a));
                g1 = f.MinOverT(x1);
            }
            else
            {
                a = x1;
                x1 = x2;
                g1 = g2;
                x2 = a + (InvPhi * (b - a));
                g2 = f.MinOverT(x2);
            }
        }

        return Math.Min(Math.Min(best, Math.Min(g1, g2)), Math.Min(f.MinOverT(0.0), f.MinOverT(1.0)));
    }

    /// <summary>f(s, t) with the nine numbers held in fields (cheap to evaluate even in a Debug build).</summary>
    private readonly struct Objective
    {
        private readonly double _rx, _ry, _rz, _ax, _ay, _az, _bx, _by, _bz;

        public Objective(Vec3 p1, Vec3 d1, Vec3 p2, Vec3 d2)
        {
            (_rx, _ry, _rz) = (p1.X - p2.X, p1.Y - p2.Y, p1.Z - p2.Z);
            (_ax, _ay, _az) = (d1.X, d1.Y, d1.Z);
            (_bx, _by, _bz) = (d2.X, d2.Y, d2.Z);
        }

        public double At(double s, double t)
        {
            var x = _rx + (s * _ax) - (t * _bx);
            var y = _ry + (s * _ay) - (t * _by);
            var z = _rz + (s * _az) - (t * _bz);
            return (x * x) + (y * y) + (z * z);
        }

        public double MinOverT(double s)
        {
            double a = 0, b = 1;
            var x1 = b - (InvPhi * (b - a));
            var x2 = a + (InvPhi * (b - a));
            var f1 = At(s, x1);
            var f2 = At(s, x2);
            for (var k = 0; k < GoldenIterations; k++)
            {
                if (f1 <= f2)
                {
                    b = x2;
                    x2 = x1;
                    f2 = f1;
                    x1 = b - (InvPhi * (b - a));
                    f1 = At(s, x1);
                }
                else
                {
                    a = x1;
                    x1 = x2;
                    f1 = f2;
                    x2 = a + (InvPhi * (b - a));
                    f2 = At(s, x2);
                }
            }

            return Math.Min(Math.Min(f1, f2), Math.Min(At(s, 0.0), At(s, 1.0)));
        }
    }
}
