using System.Runtime.Intrinsics;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;

namespace Orchard.Core.Collision;

/// <summary>
/// Configuration and edge checks of one arm in one scene. Holds scratch buffers, so one instance serves
/// one thread; make one per worker (cheap: the scene and the arm model are shared and immutable).
/// <para>
/// A configuration is free when every joint is within its limits, every moving capsule keeps
/// <see cref="CollisionSettings.SafetyMarginM"/> from the scene and <see cref="CollisionSettings.GroundMarginM"/>
/// above the ground, and non-neighbouring links (and the base) keep <see cref="CollisionSettings.SelfMarginM"/>
/// from each other, each margin with <see cref="CollisionSettings.GrazeToleranceM"/> more room (so that
/// conservative advancement can always leave a free configuration). During a cut's final approach the tool (and only the tool) may touch the limb being
/// cut: pass its group as <c>toolIgnoreGroup</c>.
/// </para>
/// <para>
/// Edges (straight joint-space segments) are checked by conservative advancement: at parameter t the
/// distances d_k of each link k to everything are measured, and every point of link k moves at most
/// B_k·Δt while t grows by Δt (<see cref="ArmCollisionModel.MotionBoundM"/>). So t may advance by
/// Δt = min_k (d_k − margin)/B_k (for a pair of links, (d − margin)/B_ab with B_ab the bound on their
/// relative motion, <see cref="ArmCollisionModel.RelativeMotionBoundM"/>) with every configuration
/// in between still free. No obstacle, however thin, can be stepped over; the edge is free when t
/// reaches 1, and colliding when the room left above a margin drops under the graze tolerance.
/// </para>
/// </summary>
public sealed class CollisionChecker
{
    private readonly Scene _scene;
    private readonly ArmCollisionModel _arm;
    private readonly CollisionSettings _settings;
    private readonly KinematicChain _chain;
    private readonly Pose3[] _frames;
    private readonly Capsule[] _world;
    private readonly double[] _centerX;
    private readonly double[] _centerY;
    private readonly double[] _centerZ;
    private readonly Vector256<double>[] _boxLow;
    private readonly Vector256<double>[] _boxHigh;
    private readonly SpherePairs _spherePairs;
    private readonly double[] _q;
    private readonly double[] _absDelta;
    private readonly double[] _linkBound;
    private readonly double[] _linkScene;
    private readonly double[] _linkGround;
    private readonly double[] _pairBound;
    private readonly int[] _order;
    private int _closestLink = -1;
    private int _closestScene = -1;
    private int _closestOtherLink = -1;

    public CollisionChecker(Scene scene, ArmCollisionModel arm, CollisionSettings? settings = null)
    {
        _scene = scene ?? throw new ArgumentNullException(nameof(scene));
        _arm = arm ?? throw new ArgumentNullException(nameof(arm));
        _settings = settings ?? CollisionSettings.Default;
        _chain = arm.Chain;
        _frames = new Pose3[_chain.JointCount];
        _world = new Capsule[arm.LocalCapsules.Length];
        _spherePairs = new SpherePairs(arm);

        // Centres of the moving capsules (placed with each configuration), then of the base's (fixed).
        var baseCenters = arm.BaseCapsulesInRoot.Select(c => c.Center).ToArray();
        _centerX = [.. new double[_world.Length], .. baseCenters.Select(c => c.X)];
        _centerY = [.. new double[_world.Length], .. baseCenters.Select(c => c.Y)];
        _centerZ = [.. new double[_world.Length], .. baseCenters.Select(c => c.Z)];

        // Boxes of the moving capsules (written by each configuration check's scene pass), then of the base's.
        _boxLow = [.. new Vector256<double>[_world.Length], .. arm.BaseCapsulesInRoot.Select(c => BoxLow(c))];
        _boxHigh = [.. new Vector256<double>[_world.Length], .. arm.BaseCapsulesInRoot.Select(c => BoxHigh(c))];
        _q = new double[_chain.JointCount];
        _absDelta = new double[_chain.JointCount];
        _linkBound = new double[_chain.JointCount + 1];
        _linkScene = new double[_chain.JointCount + 1];
        _linkGround = new double[_chain.JointCount + 1];
        _pairBound = new double[arm.SelfPairs.Length];

        // Tool capsules first: they work closest to the wood, so they find contacts soonest.
        _order = Enumerable.Range(0, _world.Length).OrderByDescending(i => arm.LinkOfCapsule[i]).ToArray();
    }

    public Scene Scene => _scene;

    public ArmCollisionModel Arm => _arm;

    public CollisionSettings Settings => _settings;

    /// <summary>Yes/no configuration checks made so far (each a full check of one configuration).</summary>
    public long ConfigurationChecks { get; private set; }

    /// <summary>Clearance evaluations made so far (distance queries: one per advancement step or clearance call).</summary>
    public long ClearanceEvaluations { get; private set; }

    /// <summary>All checks, of either kind.</summary>
    public long TotalChecks => ConfigurationChecks + ClearanceEvaluations;

    /// <summary>Is the configuration free (limits, scene, ground, self), with the margins?</summary>
    /// <param name="extraMarginM">Added to every margin (for checking a chord that stands in for a slightly curved motion).</param>
    public bool IsFree(ReadOnlySpan<double> q, int toolIgnoreGroup = CapsuleBvh.NoGroup, double extraMarginM = 0)
    {
        ConfigurationChecks++;
        if (!_chain.WithinLimits(q))
        {
            return false;
        }

        Place(q);
        var bvh = _scene.Bvh;

        // Free means room to move: every margin plus the graze tolerance, so an edge can start from any free configuration.
        var graze = _settings.GrazeToleranceM + extraMarginM;
        var ground = _scene.GroundZM + _settings.GroundMarginM + graze;
        var margin = _settings.SafetyMarginM + graze;

        // Each link capsule's box, in 256-bit lanes (x, y, z, 0), against the ground and the scene's box grown by
        // the margin: most capsules of a free arm stop here, before a tree query.
        var sceneBox = bvh.Bounds;
        var grow = margin + CapsuleBvh.PruneSlackM;
        var sceneLow = Vector256.Create(sceneBox.Min.X - grow, sceneBox.Min.Y - grow, sceneBox.Min.Z - grow, 0.0);
        var sceneHigh = Vector256.Create(sceneBox.Max.X + grow, sceneBox.Max.Y + grow, sceneBox.Max.Z + grow, 0.0);
        var grows = Vector256.Create(grow);
        foreach (var i in _order)
        {
            ref readonly var c = ref _world[i];
            var a = Vector256.Create(c.A.X, c.A.Y, c.A.Z, 0.0);
            var b = Vector256.Create(c.B.X, c.B.Y, c.B.Z, 0.0);
            var r = Vector256.Create(c.RadiusM, c.RadiusM, c.RadiusM, 0.0);
            var low = Vector256.Min(a, b) - r;
            if (low[2] < ground)
            {
                return false;
            }

            var high = Vector256.Max(a, b) + r;
            _boxLow[i] = low;
            _boxHigh[i] = high;
            var meets = Vector256.LessThanOrEqual(low, sceneHigh) & Vector256.LessThanOrEqual(sceneLow, high);
            if (meets.ExtractMostSignificantBits() != 0b1111)
            {
                continue;
            }

            // The box grown as the tree's own query grows it: (min − r) − (margin + slack), (max + r) + (margin + slack).
            var grownLow = low - grows;
            var grownHigh = high + grows;
            var grown = new Aabb(new Vec3(grownLow[0], grownLow[1], grownLow[2]), new Vec3(grownHigh[0], grownHigh[1], grownHigh[2]));
            var ignore = i >= _arm.FirstToolCapsule ? toolIgnoreGroup : CapsuleBvh.NoGroup;
            if (bvh.AnyOverlapInBounds(c, grown, margin, ignore))
            {
                return false;
            }
        }

        // Self and base pairs: bounding spheres first, four pairs at a time in 256-bit lanes, compared squared (no
        // square root); then the capsules' boxes (written by the scene pass above, which every capsule of a configuration
        // that gets here went through), grown by the margin and a nanometre so that they never reject a pair the exact
        // test would keep; then the exact test. On bench checks the boxes turn away 82 % of the pairs whose spheres meet.
        var selfMargin = _settings.SelfMarginM + graze;
        var boxGrow = Vector256.Create(Math.Max(selfMargin, 0) + CapsuleBvh.PruneSlackM);
        var (boxLow, boxHigh) = (_boxLow, _boxHigh);
        var pairs = _spherePairs;
        var (cx, cy, cz) = (_centerX, _centerY, _centerZ);
        var margins = Vector256.Create(selfMargin);
        for (var p = 0; p < pairs.Length; p += 4)
        {
            var a = pairs.A.AsSpan(p, 4);
            var b = pairs.B.AsSpan(p, 4);
            var dx = Vector256.Create(cx[a[0]], cx[a[1]], cx[a[2]], cx[a[3]]) - Vector256.Create(cx[b[0]], cx[b[1]], cx[b[2]], cx[b[3]]);
            var dy = Vector256.Create(cy[a[0]], cy[a[1]], cy[a[2]], cy[a[3]]) - Vector256.Create(cy[b[0]], cy[b[1]], cy[b[2]], cy[b[3]]);
            var dz = Vector256.Create(cz[a[0]], cz[a[1]], cz[a[2]], cz[a[3]]) - Vector256.Create(cz[b[0]], cz[b[1]], cz[b[2]], cz[b[3]]);
            var reach = Vector256.Create(pairs.Radius.AsSpan(p, 4)) + margins;
            var near = Vector256.LessThanOrEqual((dx * dx) + (dy * dy) + (dz * dz), reach * reach).ExtractMostSignificantBits() & pairs.LaneMask(p);
            while (near != 0)
            {
                var lane = System.Numerics.BitOperations.TrailingZeroCount(near);
                near &= near - 1;
                var (first, second) = (a[lane], b[lane]);
                var boxesMeet = Vector256.LessThanOrEqual(boxLow[first], boxHigh[second] + boxGrow) & Vector256.LessThanOrEqual(boxLow[second], boxHigh[first] + boxGrow);
                if (boxesMeet.ExtractMostSignificantBits() == 0b1111 && CapsuleDistance.Overlaps(_world[first], PairCapsule(second), selfMargin))
                {
                    return false;
                }
            }
        }

        return true;
    }

    /// <summary>A capsule's box in 256-bit lanes (x, y, z, 0), as the scene pass computes it.</summary>
    private static Vector256<double> BoxLow(in Capsule c) =>
        Vector256.Min(Vector256.Create(c.A.X, c.A.Y, c.A.Z, 0.0), Vector256.Create(c.B.X, c.B.Y, c.B.Z, 0.0)) - Vector256.Create(c.RadiusM, c.RadiusM, c.RadiusM, 0.0);

    private static Vector256<double> BoxHigh(in Capsule c) =>
        Vector256.Max(Vector256.Create(c.A.X, c.A.Y, c.A.Z, 0.0), Vector256.Create(c.B.X, c.B.Y, c.B.Z, 0.0)) + Vector256.Create(c.RadiusM, c.RadiusM, c.RadiusM, 0.0);

    /// <summary>A capsule of a sphere pair: a moving one (placed), or past them one of the base's.</summary>
    private Capsule PairCapsule(int index) => index < _world.Length ? _world[index] : _arm.BaseCapsulesInRoot[index - _world.Length];

    /// <summary>
    /// A lower bound on the distance between two capsules from their bounding spheres (centre at the
    /// segment's midpoint, radius half its length plus the capsule radius): |c_a − c_b| − R_a − R_b.
    /// </summary>
    private static double SphereLowerBound(in Capsule a, double boundA, in Capsule b, double boundB)
    {
        var d = ((a.A + a.B) - (b.A + b.B)) * 0.5;
        return d.Length - boundA - boundB;
    }

    /// <summary>The full report: free or not, and the smallest distance to anything with what it is.</summary>
    public ConfigurationReport Check(ReadOnlySpan<double> q, int toolIgnoreGroup = CapsuleBvh.NoGroup)
    {
        if (!_chain.WithinLimits(q))
        {
            ConfigurationChecks++;
            return new ConfigurationReport(false, double.NegativeInfinity, ContactKind.JointLimit);
        }

        Place(q);
        var free = MeasureLinks(toolIgnoreGroup, out var clearance, out var contact, out var selfFree, exactSelf: true);
        return new ConfigurationReport(free && selfFree, clearance, contact, _closestLink, _closestScene, _closestOtherLink);
    }

    /// <summary>
    /// Is the straight joint-space segment from <paramref name="from"/> to <paramref name="to"/> free,
    /// every configuration on it included? Conservative advancement; see the class summary.
    /// </summary>
    public bool IsEdgeFree(ReadOnlySpan<double> from, ReadOnlySpan<double> to, int toolIgnoreGroup = CapsuleBvh.NoGroup, double extraMarginM = 0) =>
        CheckEdge(from, to, toolIgnoreGroup, extraMarginM) == ContactKind.None;

    /// <summary>As <see cref="IsEdgeFree"/>, saying what stopped the edge (<see cref="ContactKind.None"/> when free).</summary>
    /// <param name="extraMarginM">
    /// Added to every margin: a chord checked with the largest distance any arm point can be from it added
    /// stands in for the curved motion it approximates (see <c>TrajectoryCheck</c>).
    /// </param>
    public ContactKind CheckEdge(ReadOnlySpan<double> from, ReadOnlySpan<double> to, int toolIgnoreGroup = CapsuleBvh.NoGroup, double extraMarginM = 0)
    {
        var n = _chain.JointCount;

        // Cheap yes/no checks of both ends first: most colliding edges fail here.
        if (!IsFree(from, toolIgnoreGroup, extraMarginM) || !IsFree(to, toolIgnoreGroup, extraMarginM))
        {
            return ContactKind.Wood;
        }

        // Then a few interior points in bisection order (½, ¼, ¾, …): a blocked edge usually fails here,
        // far cheaper than advancement. This only rejects; freedom is still proven by advancement below.
        for (var level = 1; level <= _settings.EdgeProbeLevels; level++)
        {
            var parts = 1 << level;
            for (var k = 1; k < parts; k += 2)
            {
                var probe = (double)k / parts;
                for (var j = 0; j < n; j++)
                {
                    _q[j] = from[j] + (probe * (to[j] - from[j]));
                }

                if (!IsFree(_q, toolIgnoreGroup, extraMarginM))
                {
                    return ContactKind.Wood;
                }
            }
        }

        for (var j = 0; j < n; j++)
        {
            _absDelta[j] = Math.Abs(to[j] - from[j]);
        }

        for (var k = 0; k <= n; k++)
        {
            _linkBound[k] = _arm.MotionBoundM(_absDelta, k);
        }

        var pairs = _arm.SelfPairs;
        for (var p = 0; p < pairs.Length; p++)
        {
            _pairBound[p] = _arm.RelativeMotionBoundM(_absDelta, _arm.LinkOfCapsule[pairs[p].A], _arm.LinkOfCapsule[pairs[p].B]);
        }

        var t = 0.0;
        var graze = _settings.GrazeToleranceM;
        for (var step = 0; step < _settings.MaxEdgeSteps; step++)
        {
            for (var j = 0; j < n; j++)
            {
                _q[j] = from[j] + (t * (to[j] - from[j]));
            }

            Place(_q);
            MeasureLinks(toolIgnoreGroup, out _, out var contact, out _, exactSelf: false, lowerBoundM: _settings.SafetyMarginM + extraMarginM + _settings.AdvancementProbeM);
            var dt = double.PositiveInfinity;
            for (var k = 0; k <= n; k++)
            {
                if (_linkBound[k] <= 0)
                {
                    continue;
                }

                var room = Math.Min(_linkScene[k] - _settings.SafetyMarginM, _linkGround[k] - _settings.GroundMarginM) - extraMarginM;
                if (room < graze)
                {
                    return contact == ContactKind.None ? ContactKind.Wood : contact;
                }

                dt = Math.Min(dt, room / _linkBound[k]);
            }

            for (var p = 0; p < pairs.Length; p++)
            {
                var (a, b) = pairs[p];
                var bound = _pairBound[p];
                if (bound <= 0)
                {
                    continue;
                }

                // The sphere bound is below the true distance, so a step it allows is safe; measure exactly only when it would limit the step.
                var quick = SphereLowerBound(_world[a], _arm.BoundingRadius[a], _world[b], _arm.BoundingRadius[b]) - _settings.SelfMarginM - extraMarginM;
                if (quick >= graze && quick / bound >= dt)
                {
                    continue;
                }

                var room = CapsuleDistance.SignedDistance(_world[a], _world[b]) - _settings.SelfMarginM - extraMarginM;
                if (room < graze)
                {
                    return ContactKind.Self;
                }

                dt = Math.Min(dt, room / bound);
            }

            foreach (var i in _arm.BasePairs)
            {
                var bound = _linkBound[_arm.LinkOfCapsule[i]];
                if (bound <= 0)
                {
                    continue;
                }

                foreach (var baseCapsule in _arm.BaseCapsulesInRoot)
                {
                    var room = CapsuleDistance.SignedDistance(_world[i], baseCapsule) - _settings.SelfMarginM - extraMarginM;
                    if (room < graze)
                    {
                        return ContactKind.Self;
                    }

                    dt = Math.Min(dt, room / bound);
                }
            }

            t += dt;
            if (t >= 1.0)
            {
                return ContactKind.None;
            }
        }

        return ContactKind.Budget;
    }

    /// <summary>
    /// Smallest distance from the arm to the scene and the ground at q, metres (the arm's own links left
    /// out): how clear of the wood, trellis and ground a configuration is.
    /// </summary>
    public double SceneClearanceM(ReadOnlySpan<double> q, int toolIgnoreGroup = CapsuleBvh.NoGroup)
    {
        if (!_chain.WithinLimits(q))
        {
            ConfigurationChecks++;
            return double.NegativeInfinity;
        }

        Place(q);
        MeasureLinks(toolIgnoreGroup, out var clearance, out _, out _, exactSelf: false);
        return clearance;
    }

    /// <summary>Smallest distance from the arm to anything (scene, ground, self) at q, metres.</summary>
    public double ClearanceM(ReadOnlySpan<double> q, int toolIgnoreGroup = CapsuleBvh.NoGroup) => Check(q, toolIgnoreGroup).ClearanceM;

    /// <summary>Places every moving capsule in the tree frame for configuration q.</summary>
    private void Place(ReadOnlySpan<double> q)
    {
        _chain.ForwardKinematics(q, _frames);
        var tool = _frames[^1] * _chain.ToolInLastLink;
        var local = _arm.LocalCapsules;
        var links = _arm.LinkOfCapsule;
        var toolLink = _arm.ToolLink;
        var frames = _frames;
        var world = _world;
        for (var i = 0; i < local.Length; i++)
        {
            var link = links[i];
            ref readonly var pose = ref link == toolLink ? ref tool : ref frames[link];
            ref var placed = ref world[i];
            placed = local[i].Transformed(pose);
            var center = (placed.A + placed.B) * 0.5;
            (_centerX[i], _centerY[i], _centerZ[i]) = (center.X, center.Y, center.Z);
        }
    }

    /// <summary>
    /// Distances of the placed arm: per link to the scene and to the ground (into the link buffers),
    /// the overall clearance and what it is; true when scene and ground margins hold; selfFree when the
    /// self margins hold.
    /// </summary>
    /// <param name="lowerBoundM">
    /// When positive, a capsule with nothing within this distance is given this distance (a lower bound,
    /// from the cheap overlap query) instead of its exact one: enough for advancement, which only needs
    /// lower bounds, and much cheaper away from obstacles.
    /// </param>
    private bool MeasureLinks(int toolIgnoreGroup, out double clearance, out ContactKind contact, out bool selfFree, bool exactSelf, double lowerBoundM = 0)
    {
        ClearanceEvaluations++;
        var n = _chain.JointCount;
        Array.Fill(_linkScene, double.PositiveInfinity);
        Array.Fill(_linkGround, double.PositiveInfinity);
        var bvh = _scene.Bvh;
        var cap = _settings.DistanceCapM;
        clearance = double.PositiveInfinity;
        contact = ContactKind.None;
        var closest = ContactKind.None;
        _closestLink = -1;
        _closestScene = -1;
        _closestOtherLink = -1;
        var stats = default(BvhQueryStats);
        for (var i = 0; i < _world.Length; i++)
        {
            ref readonly var c = ref _world[i];
            var link = _arm.LinkOfCapsule[i];
            var ignore = i >= _arm.FirstToolCapsule ? toolIgnoreGroup : CapsuleBvh.NoGroup;
            var nearest = -1;
            var d = lowerBoundM > 0 && !bvh.AnyOverlap(c, lowerBoundM, ignore)
                ? lowerBoundM
                : bvh.NearestSignedDistance(c, cap, ignore, ref stats, out nearest);
            if (d < _linkScene[link])
            {
                _linkScene[link] = d;
            }

            if (d < clearance)
            {
                clearance = d;
                closest = nearest >= 0 && _scene.Kinds[nearest] != SceneCapsuleKind.Wood ? ContactKind.Trellis : ContactKind.Wood;
                _closestLink = link;
                _closestScene = nearest;
                _closestOtherLink = -1;
            }

            var g = Math.Min(c.A.Z, c.B.Z) - c.RadiusM - _scene.GroundZM;
            if (g < _linkGround[link])
            {
                _linkGround[link] = g;
            }

            if (g < clearance)
            {
                clearance = g;
                closest = ContactKind.Ground;
                _closestLink = link;
                _closestScene = -1;
                _closestOtherLink = -1;
            }
        }

        var free = true;
        for (var k = 0; k <= n; k++)
        {
            if (!(_linkScene[k] > _settings.SafetyMarginM + _settings.GrazeToleranceM) || !(_linkGround[k] >= _settings.GroundMarginM + _settings.GrazeToleranceM))
            {
                free = false;
            }
        }

        selfFree = true;
        if (!exactSelf)
        {
            // Advancement measures the self pairs itself, with a cheaper bound first.
            contact = free ? ContactKind.None : closest;
            return free;
        }

        foreach (var (a, b) in _arm.SelfPairs)
        {
            var d = CapsuleDistance.SignedDistance(_world[a], _world[b]);
            selfFree &= d > _settings.SelfMarginM + _settings.GrazeToleranceM;
            if (d < clearance)
            {
                clearance = d;
                closest = ContactKind.Self;
                _closestLink = _arm.LinkOfCapsule[a];
                _closestScene = -1;
                _closestOtherLink = _arm.LinkOfCapsule[b];
            }
        }

        foreach (var i in _arm.BasePairs)
        {
            foreach (var baseCapsule in _arm.BaseCapsulesInRoot)
            {
                var d = CapsuleDistance.SignedDistance(_world[i], baseCapsule);
                selfFree &= d > _settings.SelfMarginM + _settings.GrazeToleranceM;
                if (d < clearance)
                {
                    clearance = d;
                    closest = ContactKind.Self;
                    _closestLink = _arm.LinkOfCapsule[i];
                    _closestScene = -1;
                    _closestOtherLink = _arm.JointCount + 1;
                }
            }
        }

        contact = free && selfFree ? ContactKind.None : closest;
        return free;
    }
}
