using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;

namespace Orchard.Core.Collision;

/// <summary>
/// The arm's collision geometry, flattened for fast checks: every capsule of every moving link and of
/// the tool, the link each belongs to, the self-collision pairs to test, and per link the bound on how
/// fast its points can move (used by conservative advancement). Links are numbered 0..n−1 for the
/// joints' links and n for the tool; the base's capsules are fixed in the tree frame once the platform
/// stands, so they are kept apart (<see cref="BaseCapsulesInRoot"/>).
/// Immutable; safe to share between threads.
/// </summary>
public sealed class ArmCollisionModel
{
    public ArmCollisionModel(ArmProfile profile, KinematicChain chain)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(chain);
        Chain = chain;
        JointCount = chain.JointCount;
        ToolLink = JointCount;

        var local = new List<Capsule>();
        var links = new List<int>();
        for (var j = 0; j < profile.Joints.Count; j++)
        {
            foreach (var c in profile.Joints[j].LinkCapsules)
            {
                local.Add(ToCapsule(c));
                links.Add(j);
            }
        }

        FirstToolCapsule = local.Count;
        foreach (var c in profile.Tool.ShearCapsules)
        {
            local.Add(ToCapsule(c));
            links.Add(ToolLink);
        }

        LocalCapsules = local.ToArray();
        LinkOfCapsule = links.ToArray();
        BaseCapsulesInRoot = profile.BaseCapsules.Select(c => ToCapsule(c).Transformed(chain.BaseInRoot)).ToArray();
        BoundingRadius = LocalCapsules.Select(c => (0.5 * c.SegmentLengthM) + c.RadiusM).ToArray();
        BaseBoundingRadius = BaseCapsulesInRoot.Select(c => (0.5 * c.SegmentLengthM) + c.RadiusM).ToArray();

        // Self pairs: capsules on links at least two apart (neighbours always touch at their joint),
        // and every moving capsule against the base except the first link's, which rides on it.
        var pairs = new List<(int, int)>();
        for (var a = 0; a < LocalCapsules.Length; a++)
        {
            for (var b = a + 1; b < LocalCapsules.Length; b++)
            {
                if (Math.Abs(LinkOfCapsule[a] - LinkOfCapsule[b]) >= 2)
                {
                    pairs.Add((a, b));
                }
            }
        }

        SelfPairs = DropAlwaysTouching(pairs, out var dropped);
        AlwaysTouchingPairs = dropped;
        BasePairs = Enumerable.Range(0, LocalCapsules.Length).Where(i => LinkOfCapsule[i] >= 1).ToArray();
        ReachFromJoint = ComputeReach(profile);
        LinkNames = [.. profile.Joints.Select(j => j.Name), "shear", "base"];
    }

    private ArmCollisionModel(ArmCollisionModel other, KinematicChain chain, IReadOnlyList<CapsuleSpec> baseCapsules, IReadOnlyList<string> linkNames)
    {
        Chain = chain;
        JointCount = other.JointCount;
        ToolLink = other.ToolLink;
        LocalCapsules = other.LocalCapsules;
        LinkOfCapsule = other.LinkOfCapsule;
        FirstToolCapsule = other.FirstToolCapsule;
        BaseCapsulesInRoot = baseCapsules.Select(c => ToCapsule(c).Transformed(chain.BaseInRoot)).ToArray();
        BoundingRadius = other.BoundingRadius;
        BaseBoundingRadius = BaseCapsulesInRoot.Select(c => (0.5 * c.SegmentLengthM) + c.RadiusM).ToArray();
        SelfPairs = other.SelfPairs;
        AlwaysTouchingPairs = other.AlwaysTouchingPairs;
        BasePairs = other.BasePairs;
        ReachFromJoint = other.ReachFromJoint;
        LinkNames = linkNames;
    }

    /// <summary>
    /// The same arm on a chain standing elsewhere (<see cref="KinematicChain.WithBase"/>): everything that does
    /// not depend on where the platform stands (self pairs, the always-touching analysis, motion bounds)
    /// is shared; only the base's capsules are placed anew.
    /// </summary>
    public ArmCollisionModel PlacedOn(KinematicChain chain, ArmProfile profile)
    {
        ArgumentNullException.ThrowIfNull(chain);
        ArgumentNullException.ThrowIfNull(profile);
        return new ArmCollisionModel(this, chain, profile.BaseCapsules, LinkNames);
    }

    /// <summary>Names of the links 0..n−1 (after their joints), then <c>shear</c> for the tool, then <c>base</c>.</summary>
    public IReadOnlyList<string> LinkNames { get; }

    public KinematicChain Chain { get; }

    public int JointCount { get; }

    /// <summary>The tool's link number (= joint count).</summary>
    public int ToolLink { get; }

    /// <summary>Every moving capsule in its own link's frame (tool capsules in the TCP frame).</summary>
    public Capsule[] LocalCapsules { get; }

    public int[] LinkOfCapsule { get; }

    /// <summary>Capsules from this index on belong to the tool.</summary>
    public int FirstToolCapsule { get; }

    public Capsule[] BaseCapsulesInRoot { get; }

    /// <summary>Radius of each moving capsule's bounding sphere about its segment's midpoint.</summary>
    public double[] BoundingRadius { get; }

    /// <summary>Radius of each base capsule's bounding sphere about its segment's midpoint.</summary>
    public double[] BaseBoundingRadius { get; }

    /// <summary>Pairs of moving capsules to test against each other.</summary>
    public (int A, int B)[] SelfPairs { get; }

    /// <summary>
    /// Pairs left out of the self checks because they touch in nearly every configuration: parts of
    /// one rigid assembly split across links (a tool body over the wrist, say). Found by sampling, see
    /// <see cref="DropAlwaysTouching"/>; the same idea as the "always in collision" pairs robot
    /// description tools disable.
    /// </summary>
    public (int A, int B)[] AlwaysTouchingPairs { get; }

    /// <summary>Moving capsules to test against the base's capsules.</summary>
    public int[] BasePairs { get; }

    /// <summary>
    /// <c>ReachFromJoint[j, k]</c>: an upper bound on the distance from joint j's axis to any point of
    /// link k (k ≥ j) in any configuration: the lengths of the joint offsets from j+1 to k (plus the
    /// largest travel of any prismatic joint among them) plus the farthest capsule surface point of
    /// link k from its own frame's origin. For a prismatic joint the
    /// entry is 1 (its points move exactly as far as the joint). Zero for k &lt; j.
    /// </summary>
    public double[,] ReachFromJoint { get; }

    /// <summary>
    /// Upper bound on how far any point of link k moves while the joints move by |Δq_j| each
    /// (Σ_j≤k |Δq_j|·ReachFromJoint[j, k]): a revolute joint turning by θ moves a point at distance r
    /// from its axis along an arc of length r·θ, a prismatic joint moves it by its own travel, and the
    /// motions add along the chain.
    /// </summary>
    public double MotionBoundM(ReadOnlySpan<double> absoluteDelta, int link)
    {
        var bound = 0.0;
        for (var j = 0; j <= Math.Min(link, JointCount - 1); j++)
        {
            bound += absoluteDelta[j] * ReachFromJoint[j, link];
        }

        return bound;
    }

    /// <summary>
    /// Sample configurations for the always-touching test: the zero and stow configurations and this
    /// many uniform ones within the limits, from a fixed seed (so the model is the same every time).
    /// </summary>
    public const int AlwaysTouchingSamples = 256;

    /// <summary>A pair touching (with no margin) in at least this share of the samples is left out.</summary>
    public const double AlwaysTouchingShare = 0.95;

    private (int A, int B)[] DropAlwaysTouching(List<(int A, int B)> pairs, out (int A, int B)[] dropped)
    {
        var n = Chain.JointCount;
        var random = new Randomness.DeterministicRandom(0x5EED);
        var frames = new Pose3[n];
        var world = new Capsule[LocalCapsules.Length];
        var touching = new int[pairs.Count];
        var samples = AlwaysTouchingSamples + 1;
        var q = new double[n];
        for (var s = 0; s < samples; s++)
        {
            for (var j = 0; j < n; j++)
            {
                q[j] = s == 0 ? Math.Clamp(0, Chain.LowerLimits[j], Chain.UpperLimits[j]) : random.NextDouble(Chain.LowerLimits[j], Chain.UpperLimits[j]);
            }

            Chain.ForwardKinematics(q, frames);
            var tool = frames[^1] * Chain.ToolInLastLink;
            for (var i = 0; i < world.Length; i++)
            {
                world[i] = LocalCapsules[i].Transformed(LinkOfCapsule[i] == ToolLink ? tool : frames[LinkOfCapsule[i]]);
            }

            for (var p = 0; p < pairs.Count; p++)
            {
                if (CapsuleDistance.SignedDistance(world[pairs[p].A], world[pairs[p].B]) < 0)
                {
                    touching[p]++;
                }
            }
        }

        dropped = pairs.Where((_, p) => touching[p] >= AlwaysTouchingShare * samples).ToArray();
        return pairs.Where((_, p) => touching[p] < AlwaysTouchingShare * samples).ToArray();
    }

    /// <summary>
    /// Upper bound on how fast the distance between a point of link <paramref name="linkA"/> and a
    /// point of link <paramref name="linkB"/> can change: their relative position depends only on the
    /// joints between them, so only those joints count (Σ over a &lt; j ≤ b of |Δq_j|·ReachFromJoint[j, b]).
    /// Parts that turn about each other's axis, like a wrist and the tool it rolls, get small bounds.
    /// </summary>
    public double RelativeMotionBoundM(ReadOnlySpan<double> absoluteDelta, int linkA, int linkB)
    {
        var (low, high) = linkA <= linkB ? (linkA, linkB) : (linkB, linkA);
        var bound = 0.0;
        for (var j = low + 1; j <= Math.Min(high, JointCount - 1); j++)
        {
            bound += absoluteDelta[j] * ReachFromJoint[j, high];
        }

        return bound;
    }

    private double[,] ComputeReach(ArmProfile profile)
    {
        var n = JointCount;
        var linkExtent = new double[n + 1];
        for (var i = 0; i < LocalCapsules.Length; i++)
        {
            var c = LocalCapsules[i];
            var extent = Math.Max(c.A.Length, c.B.Length) + c.RadiusM;
            linkExtent[LinkOfCapsule[i]] = Math.Max(linkExtent[LinkOfCapsule[i]], extent);
        }

        // Offsets between successive joint frames; the tool frame sits at the TCP offset from the last link.
        var offset = new double[n + 1];
        for (var j = 1; j < n; j++)
        {
            var o = profile.Joints[j].OriginM;
            offset[j] = Math.Sqrt((o.X * o.X) + (o.Y * o.Y) + (o.Z * o.Z));
        }

        offset[n] = Chain.ToolInLastLink.Translation.Length;

        // A prismatic joint further out also lengthens the chain by up to its largest travel.
        for (var j = 1; j < n; j++)
        {
            if (profile.Joints[j].Kind == JointKind.Prismatic)
            {
                offset[j] += Math.Max(Math.Abs(profile.Joints[j].LowerLimit), Math.Abs(profile.Joints[j].UpperLimit));
            }
        }

        var reach = new double[n, n + 1];
        for (var j = 0; j < n; j++)
        {
            if (profile.Joints[j].Kind == JointKind.Prismatic)
            {
                for (var k = j; k <= n; k++)
                {
                    reach[j, k] = 1.0;
                }

                continue;
            }

            var along = 0.0;
            for (var k = j; k <= n; k++)
            {
                if (k > j)
                {
                    along += offset[k];
                }

                reach[j, k] = along + linkExtent[k];
            }
        }

        return reach;
    }

    private static Capsule ToCapsule(CapsuleSpec c) =>
        new(new Vec3(c.StartM.X, c.StartM.Y, c.StartM.Z), new Vec3(c.EndM.X, c.EndM.Y, c.EndM.Z), c.RadiusM);
}
