using Orchard.Core.Geometry;
using Orchard.Core.Model;

namespace Orchard.Core.Collision;

/// <summary>
/// Everything the arm must not touch around one tree, in the tree frame: the wood as capsules (one per
/// branch, with the larger of its two end radii, so the capsule holds the whole truncated cone), the
/// trellis wires and posts, and the ground (z = 0, the trunk base). Immutable; safe to share between
/// threads.
/// <para>
/// Groups: each branch belongs to a limb, a chain of branches where every node continues into its
/// thickest child; the other children start limbs of their own. A limb's group number lets a query
/// ignore "the limb being cut" (the shear may touch it during the final approach, nothing else may).
/// Obstacles get groups after the limbs.
/// </para>
/// </summary>
public sealed class Scene
{
    private Scene(Capsule[] capsules, int[] groups, SceneCapsuleKind[] kinds, int[] branchOfCapsule, int[] limbOfBranch, int limbCount, double groundZM)
    {
        Capsules = capsules;
        Groups = groups;
        Kinds = kinds;
        BranchOfCapsule = branchOfCapsule;
        LimbOfBranch = limbOfBranch;
        LimbCount = limbCount;
        GroundZM = groundZM;
        Bvh = new CapsuleBvh(capsules, groups);
    }

    public CapsuleBvh Bvh { get; }

    /// <summary>Scene capsules in the tree frame; index i matches <see cref="Groups"/>[i] and <see cref="Kinds"/>[i].</summary>
    public IReadOnlyList<Capsule> Capsules { get; }

    public IReadOnlyList<int> Groups { get; }

    public IReadOnlyList<SceneCapsuleKind> Kinds { get; }

    /// <summary>For wood capsules the scan's branch index, else −1.</summary>
    public IReadOnlyList<int> BranchOfCapsule { get; }

    /// <summary>
    /// The limb group of each branch of the scan, indexed like the scan's branches. Removed wood keeps its group (see
    /// <see cref="WithoutBranches"/>); −1 only for a branch no root reaches, which validation refuses.
    /// </summary>
    public IReadOnlyList<int> LimbOfBranch { get; }

    public int LimbCount { get; }

    /// <summary>Height of the ground in the tree frame.</summary>
    public double GroundZM { get; }

    /// <summary>Builds the scene of a scan that passed validation.</summary>
    public static Scene FromScan(TreeScan scan) => Build(scan, removedBranches: null);

    /// <summary>
    /// The scene after some wood is gone (cut off): the given branches are no longer obstacles. Limb
    /// groups stay as in the full tree, so candidates computed on the full scene stay valid.
    /// </summary>
    public static Scene WithoutBranches(TreeScan scan, IReadOnlySet<int> removedBranches) => Build(scan, removedBranches);

    private static Scene Build(TreeScan scan, IReadOnlySet<int>? removedBranches)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var nodeIndex = new Dictionary<string, int>(scan.Nodes.Count, StringComparer.Ordinal);
        for (var i = 0; i < scan.Nodes.Count; i++)
        {
            nodeIndex[scan.Nodes[i].Id] = i;
        }

        var limbOfBranch = LimbGroups.Assign(scan, nodeIndex, out var limbCount);
        var capsules = new List<Capsule>(scan.Branches.Count + scan.Obstacles.Count);
        var groups = new List<int>(capsules.Capacity);
        var kinds = new List<SceneCapsuleKind>(capsules.Capacity);
        var branchOf = new List<int>(capsules.Capacity);
        for (var b = 0; b < scan.Branches.Count; b++)
        {
            if (removedBranches is not null && removedBranches.Contains(b))
            {
                continue;
            }

            var branch = scan.Branches[b];
            var from = scan.Nodes[nodeIndex[branch.FromNode]];
            var to = scan.Nodes[nodeIndex[branch.ToNode]];
            capsules.Add(new Capsule(new Vec3(from.XM, from.YM, from.ZM), new Vec3(to.XM, to.YM, to.ZM), Math.Max(branch.FromRadiusM, branch.ToRadiusM)));
            groups.Add(limbOfBranch[b]);
            kinds.Add(SceneCapsuleKind.Wood);
            branchOf.Add(b);
        }

        for (var o = 0; o < scan.Obstacles.Count; o++)
        {
            var obstacle = scan.Obstacles[o];
            capsules.Add(new Capsule(ToVec(obstacle.StartM), ToVec(obstacle.EndM), obstacle.RadiusM));
            groups.Add(limbCount + o);
            kinds.Add(obstacle.Kind switch
            {
                ObstacleKind.Wire => SceneCapsuleKind.Wire,
                ObstacleKind.Post => SceneCapsuleKind.Post,
                _ => SceneCapsuleKind.Other,
            });
            branchOf.Add(-1);
        }

        return new Scene(capsules.ToArray(), groups.ToArray(), kinds.ToArray(), branchOf.ToArray(), limbOfBranch, limbCount, groundZM: 0.0);
    }

    private static Vec3 ToVec(Vector3M v) => new(v.X, v.Y, v.Z);
}
