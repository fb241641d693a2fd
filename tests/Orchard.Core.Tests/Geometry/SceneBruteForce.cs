using Orchard.Core.Geometry;

namespace Orchard.Core.Tests.Geometry;

/// <summary>
/// The reference for <see cref="CapsuleBvh"/>: a linear loop over every scene capsule calling the public
/// <see cref="CapsuleDistance"/> functions with the query first, as the tree documents.
/// </summary>
/// <remarks>
/// The loop over 2,000 capsules × 10,000 queries is too slow in a Debug test run if every pair is a full closest-point
/// computation, so <see cref="AnyOverlap"/> and <see cref="Nearest"/> first reject a pair with bounding spheres — a
/// mechanism unrelated to the tree's boxes. Each capsule lies inside the sphere about its segment midpoint of radius
/// half-length + radius, so its signed distance to the query is at least
/// |centre distance| − (both sphere radii); a pair is skipped only when that bound exceeds the threshold by
/// <see cref="SlackM"/> (1e-9 m, far above the ~1e-15 m rounding of these unit-scale numbers), so a skipped pair could
/// not have changed the answer. <see cref="AnyOverlapUnfiltered"/> and <see cref="NearestUnfiltered"/> are the plain
/// loops, used to check the filtered ones on a sample.
/// </remarks>
internal sealed class SceneBruteForce
{
    private const double SlackM = 1e-9;

    private readonly Capsule[] _scene;
    private readonly int[] _groups;
    private readonly double[] _cx;
    private readonly double[] _cy;
    private readonly double[] _cz;
    private readonly double[] _bound;

    public SceneBruteForce(Capsule[] scene, int[] groups)
    {
        _scene = scene;
        _groups = groups;
        _cx = new double[scene.Length];
        _cy = new double[scene.Length];
        _cz = new double[scene.Length];
        _bound = new double[scene.Length];
        for (var i = 0; i < scene.Length; i++)
        {
            var c = scene[i].Center;
            (_cx[i], _cy[i], _cz[i]) = (c.X, c.Y, c.Z);
            _bound[i] = (0.5 * scene[i].SegmentLengthM) + scene[i].RadiusM;
        }
    }

    public bool AnyOverlap(in Capsule query, double marginM, int ignoreGroup)
    {
        var (qx, qy, qz, qb) = Sphere(query);
        for (var i = 0; i < _scene.Length; i++)
        {
            if (_groups[i] == ignoreGroup)
            {
                continue;
            }

            var reach = marginM + SlackM + qb + _bound[i];
            var dx = _cx[i] - qx;
            var dy = _cy[i] - qy;
            var dz = _cz[i] - qz;
            if (reach >= 0 && (dx * dx) + (dy * dy) + (dz * dz) > reach * reach)
            {
                continue;
            }

            if (CapsuleDistance.Overlaps(query, _scene[i], marginM))
            {
                return true;
            }
        }

        return false;
    }

    public double Nearest(in Capsule query, double maxDistanceM, int ignoreGroup)
    {
        var (qx, qy, qz, qb) = Sphere(query);
        var best = maxDistanceM;
        for (var i = 0; i < _scene.Length; i++)
        {
            if (_groups[i] == ignoreGroup)
            {
                continue;
            }

            var reach = best + SlackM + qb + _bound[i];
            var dx = _cx[i] - qx;
            var dy = _cy[i] - qy;
            var dz = _cz[i] - qz;
            if (reach >= 0 && (dx * dx) + (dy * dy) + (dz * dz) > reach * reach)
            {
                continue;
            }

            best = Math.Min(best, CapsuleDistance.SignedDistance(query, _scene[i]));
        }

        return best;
    }

    public bool AnyOverlapUnfiltered(in Capsule query, double marginM, int ignoreGroup)
    {
        for (var i = 0; i < _scene.Length; i++)
        {
            if (_groups[i] != ignoreGroup && CapsuleDistance.Overlaps(query, _scene[i], marginM))
            {
                return true;
            }
        }

        return false;
    }

    public double NearestUnfiltered(in Capsule query, double maxDistanceM, int ignoreGroup)
    {
        var best = maxDistanceM;
        for (var i = 0; i < _scene.Length; i++)
        {
            if (_groups[i] != ignoreGroup)
            {
                best = Math.Min(best, CapsuleDistance.SignedDistance(query, _scene[i]));
            }
        }

        return best;
    }

    private static (double X, double Y, double Z, double Bound) Sphere(in Capsule c)
    {
        var center = c.Center;
        return (center.X, center.Y, center.Z, (0.5 * c.SegmentLengthM) + c.RadiusM);
    }
}
