using Orchard.Core.Collision;
using Orchard.Core.Geometry;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// The reference for <see cref="CollisionChecker.IsFree"/> and <see cref="CollisionChecker.Check"/>: the arm placed by
/// <see cref="BruteForceArm"/>, then every moving capsule against every scene capsule (skipping, for the tool's
/// capsules only, those in the ignored group), against the ground plane z = <see cref="Scene.GroundZM"/>, and every
/// pair of <see cref="ArmCollisionModel.SelfPairs"/> and <see cref="ArmCollisionModel.BasePairs"/> (the base capsules
/// placed here from the profile), each distance from <see cref="BruteForceSegments"/>.
/// </summary>
/// <remarks>
/// Scene pairs are first rejected by bounding spheres (each capsule lies in the sphere about its segment midpoint of
/// radius half-length + radius, so its signed distance to another is at least centre distance − both sphere radii):
/// a pair is skipped only when that bound exceeds <see cref="CollisionSettings.DistanceCapM"/> by 1e-9 m, so every
/// distance below the cap, and every margin test (all margins are below the cap), is still computed exactly.
/// </remarks>
internal sealed class BruteForceChecker
{
    private const double SphereSlackM = 1e-9;

    private readonly Scene _scene;
    private readonly ArmCollisionModel _model;
    private readonly BruteForceArm _arm;
    private readonly CollisionSettings _settings;
    private readonly Capsule[] _sceneCapsules;
    private readonly Vec3[] _sceneCentres;
    private readonly double[] _sceneSphere;
    private readonly Capsule[] _world;

    public BruteForceChecker(Scene scene, ArmCollisionModel model, BruteForceArm arm, CollisionSettings settings)
    {
        _scene = scene;
        _model = model;
        _arm = arm;
        _settings = settings;
        _sceneCapsules = scene.Capsules.ToArray();
        _sceneCentres = _sceneCapsules.Select(c => (c.A + c.B) * 0.5).ToArray();
        _sceneSphere = _sceneCapsules.Select(c => (0.5 * Vec3.Distance(c.A, c.B)) + c.RadiusM).ToArray();
        _world = new Capsule[arm.LocalCapsules.Count];
    }

    public BruteForceArm Arm => _arm;

    /// <summary>The group of the scene capsule nearest to any moving capsule that is not the tool's, at q.</summary>
    public int NearestGroupToLinks(ReadOnlySpan<double> q)
    {
        _arm.Place(q, _world);
        var best = double.PositiveInfinity;
        var group = -1;
        for (var i = 0; i < _arm.FirstToolCapsule; i++)
        {
            for (var s = 0; s < _sceneCapsules.Length; s++)
            {
                var d = BruteForceSegments.SignedDistance(_world[i], _sceneCapsules[s]);
                if (d < best)
                {
                    best = d;
                    group = _scene.Groups[s];
                }
            }
        }

        return group;
    }

    /// <param name="ignoreForEveryCapsule">
    /// Ignore the group for every moving capsule, not only the tool's: the wrong rule, used to show that a test's
    /// configurations tell the two apart.
    /// </param>
    public BruteForceVerdict Evaluate(ReadOnlySpan<double> q, int toolIgnoreGroup, bool ignoreForEveryCapsule = false)
    {
        if (!_arm.WithinLimits(q))
        {
            return new BruteForceVerdict(false, false, double.NegativeInfinity, ContactKind.JointLimit, double.NegativeInfinity, double.PositiveInfinity);
        }

        _arm.Place(q, _world);
        var cap = _settings.DistanceCapM;
        var wood = double.PositiveInfinity;
        var trellis = double.PositiveInfinity;
        var ground = double.PositiveInfinity;
        var self = double.PositiveInfinity;
        var room = double.PositiveInfinity;
        for (var i = 0; i < _world.Length; i++)
        {
            var c = _world[i];
            var ignores = ignoreForEveryCapsule || i >= _arm.FirstToolCapsule;
            var centre = (c.A + c.B) * 0.5;
            var sphere = (0.5 * Vec3.Distance(c.A, c.B)) + c.RadiusM;
            for (var s = 0; s < _sceneCapsules.Length; s++)
            {
                if (ignores && _scene.Groups[s] == toolIgnoreGroup)
                {
                    continue;
                }

                if (Vec3.Distance(centre, _sceneCentres[s]) - sphere - _sceneSphere[s] > cap + SphereSlackM)
                {
                    continue;
                }

                var d = BruteForceSegments.SignedDistance(c, _sceneCapsules[s]);
                room = Math.Min(room, d - _settings.SafetyMarginM - _settings.GrazeToleranceM);
                if (_scene.Kinds[s] == SceneCapsuleKind.Wood)
                {
                    wood = Math.Min(wood, d);
                }
                else
                {
                    trellis = Math.Min(trellis, d);
                }
            }

            var height = Math.Min(c.A.Z, c.B.Z) - c.RadiusM - _scene.GroundZM;
            room = Math.Min(room, height - _settings.GroundMarginM - _settings.GrazeToleranceM);
            ground = Math.Min(ground, height);
        }

        foreach (var (a, b) in _model.SelfPairs)
        {
            var d = BruteForceSegments.SignedDistance(_world[a], _world[b]);
            room = Math.Min(room, d - _settings.SelfMarginM - _settings.GrazeToleranceM);
            self = Math.Min(self, d);
        }

        foreach (var i in _model.BasePairs)
        {
            foreach (var baseCapsule in _arm.BaseCapsulesInTree)
            {
                var d = BruteForceSegments.SignedDistance(_world[i], baseCapsule);
                room = Math.Min(room, d - _settings.SelfMarginM - _settings.GrazeToleranceM);
                self = Math.Min(self, d);
            }
        }

        Span<double> byKind = [wood, trellis, ground, self];
        ReadOnlySpan<ContactKind> kinds = [ContactKind.Wood, ContactKind.Trellis, ContactKind.Ground, ContactKind.Self];
        var best = 0;
        for (var k = 1; k < byKind.Length; k++)
        {
            if (byKind[k] < byKind[best])
            {
                best = k;
            }
        }

        var gap = double.PositiveInfinity;
        for (var k = 0; k < byKind.Length; k++)
        {
            if (k != best)
            {
                gap = Math.Min(gap, byKind[k] - byKind[best]);
            }
        }

        return new BruteForceVerdict(true, room > 0, byKind[best], kinds[best], room, gap);
    }
}
