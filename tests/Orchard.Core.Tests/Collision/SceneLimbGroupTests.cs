using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Collision;

public sealed class SceneLimbGroupTests
{
    public static TheoryData<int> Trees => new(Enumerable.Range(0, 24));

    [Theory]
    [MemberData(nameof(Trees))]
    public void Scene_capsules_are_the_scan_s_wood_and_obstacles(int tree)
    {
        var scan = CollisionTestCells.Orchard.Trees[tree].Scan;
        var scene = Scene.FromScan(scan);
        var nodes = scan.Nodes.ToDictionary(n => n.Id, n => new Vec3(n.XM, n.YM, n.ZM));
        Assert.Equal(scan.Branches.Count + scan.Obstacles.Count, scene.Capsules.Count);
        Assert.Equal(scene.Capsules.Count, scene.Groups.Count);
        Assert.Equal(scene.Capsules.Count, scene.Kinds.Count);
        Assert.Equal(scene.Capsules.Count, scene.Bvh.Count);
        Assert.Equal(0.0, scene.GroundZM);
        for (var b = 0; b < scan.Branches.Count; b++)
        {
            var branch = scan.Branches[b];
            Assert.Equal(new Capsule(nodes[branch.FromNode], nodes[branch.ToNode], Math.Max(branch.FromRadiusM, branch.ToRadiusM)), scene.Capsules[b]);
            Assert.Equal(SceneCapsuleKind.Wood, scene.Kinds[b]);
            Assert.Equal(b, scene.BranchOfCapsule[b]);
            Assert.Equal(scene.LimbOfBranch[b], scene.Groups[b]);
        }

        for (var o = 0; o < scan.Obstacles.Count; o++)
        {
            var obstacle = scan.Obstacles[o];
            var i = scan.Branches.Count + o;
            Assert.Equal(new Capsule(ToVec(obstacle.StartM), ToVec(obstacle.EndM), obstacle.RadiusM), scene.Capsules[i]);
            Assert.Equal(obstacle.Kind == ObstacleKind.Wire ? SceneCapsuleKind.Wire : SceneCapsuleKind.Post, scene.Kinds[i]);
            Assert.Equal(-1, scene.BranchOfCapsule[i]);
        }
    }

    [Theory]
    [MemberData(nameof(Trees))]
    public void Limbs_follow_the_thickest_child_rule_and_each_is_one_connected_chain(int tree)
    {
        var scan = CollisionTestCells.Orchard.Trees[tree].Scan;
        var scene = Scene.FromScan(scan);
        var limb = scene.LimbOfBranch;
        var branches = scan.Branches;
        Assert.Equal(branches.Count, limb.Count);

        // Every branch has a limb, and every limb number is used.
        Assert.All(limb, g => Assert.InRange(g, 0, scene.LimbCount - 1));
        Assert.Equal(scene.LimbCount, limb.Distinct().Count());

        var childrenOf = branches.Select((b, i) => (b, i)).ToLookup(x => x.b.FromNode, x => x.i);
        var incoming = branches.Select((b, i) => (b, i)).ToDictionary(x => x.b.ToNode, x => x.i);

        // At every node the thickest child (the first listed among equals) carries the incoming limb on; every other
        // child starts a limb of its own. At a root every child starts one.
        foreach (var node in scan.Nodes)
        {
            var children = childrenOf[node.Id].ToList();
            if (children.Count == 0)
            {
                continue;
            }

            var thickest = children[0];
            foreach (var c in children)
            {
                if (branches[c].FromRadiusM > branches[thickest].FromRadiusM)
                {
                    thickest = c;
                }
            }

            var hasIncoming = incoming.TryGetValue(node.Id, out var parent);
            var started = new HashSet<int>();
            foreach (var c in children)
            {
                if (hasIncoming && c == thickest)
                {
                    Assert.Equal(limb[parent], limb[c]);
                }
                else
                {
                    Assert.True(!hasIncoming || limb[c] != limb[parent], $"branch {c} should start a limb");
                    Assert.True(started.Add(limb[c]), $"siblings share limb {limb[c]}");
                }
            }
        }

        // The leader: from the root along the thickest children, up to the top of the tree; all of it one group, and
        // nothing else in that group.
        var root = Assert.Single(scan.Nodes, n => !incoming.ContainsKey(n.Id));
        var leader = new List<int>();
        for (var node = root.Id; childrenOf[node].Any();)
        {
            var next = childrenOf[node].MaxBy(c => branches[c].FromRadiusM);
            leader.Add(next);
            node = branches[next].ToNode;
        }

        var leaderGroup = limb[leader[0]];
        Assert.Equal(leader.Order(), Enumerable.Range(0, branches.Count).Where(b => limb[b] == leaderGroup));
        var top = scan.Nodes.MaxBy(n => n.ZM)!;
        Assert.Equal(top.Id, branches[leader[^1]].ToNode);

        // Each limb is a chain: one first branch, each branch followed by at most one of the same limb, all reached.
        foreach (var group in Enumerable.Range(0, scene.LimbCount))
        {
            var members = Enumerable.Range(0, branches.Count).Where(b => limb[b] == group).ToHashSet();
            var firsts = members.Where(b => !(incoming.TryGetValue(branches[b].FromNode, out var p) && members.Contains(p))).ToList();
            var first = Assert.Single(firsts);
            var visited = new List<int> { first };
            while (true)
            {
                var next = childrenOf[branches[visited[^1]].ToNode].Where(members.Contains).ToList();
                Assert.True(next.Count <= 1, $"limb {group} forks");
                if (next.Count == 0)
                {
                    break;
                }

                visited.Add(next[0]);
            }

            Assert.Equal(members.Count, visited.Count);
        }
    }

    [Theory]
    [MemberData(nameof(Trees))]
    public void Obstacles_have_groups_of_their_own(int tree)
    {
        var scan = CollisionTestCells.Orchard.Trees[tree].Scan;
        var scene = Scene.FromScan(scan);
        var woodGroups = Enumerable.Range(0, scene.Capsules.Count).Where(i => scene.Kinds[i] == SceneCapsuleKind.Wood).Select(i => scene.Groups[i]).ToHashSet();
        var obstacleGroups = Enumerable.Range(0, scene.Capsules.Count).Where(i => scene.Kinds[i] != SceneCapsuleKind.Wood).Select(i => scene.Groups[i]).ToList();
        Assert.Equal(scan.Obstacles.Count, obstacleGroups.Count);
        Assert.Equal(obstacleGroups.Count, obstacleGroups.Distinct().Count());
        Assert.All(obstacleGroups, g => Assert.DoesNotContain(g, woodGroups));
        Assert.All(obstacleGroups, g => Assert.True(g >= scene.LimbCount));
    }

    [Theory]
    [InlineData(0)]
    [InlineData(7)]
    [InlineData(13)]
    [InlineData(22)]
    public void WithoutBranches_drops_exactly_those_capsules_and_keeps_every_group(int tree)
    {
        var scan = CollisionTestCells.Orchard.Trees[tree].Scan;
        var full = Scene.FromScan(scan);
        var random = new DeterministicRandom(0x5C3E + (ulong)tree);

        // What a cut takes away: a limb from its cut branch outwards; plus a few branches anywhere.
        var removed = new HashSet<int>();
        var cutLimb = full.LimbOfBranch[scan.Branches.ToList().FindIndex(b => b.Id == scan.Cuts[0].BranchId)];
        removed.UnionWith(Enumerable.Range(0, scan.Branches.Count).Where(b => full.LimbOfBranch[b] == cutLimb));
        for (var k = 0; k < 5; k++)
        {
            removed.Add(random.NextInt(scan.Branches.Count));
        }

        var pruned = Scene.WithoutBranches(scan, removed);
        var kept = Enumerable.Range(0, full.Capsules.Count).Where(i => full.BranchOfCapsule[i] < 0 || !removed.Contains(full.BranchOfCapsule[i])).ToList();
        Assert.Equal(kept.Count, pruned.Capsules.Count);
        Assert.Equal(full.Capsules.Count - removed.Count, pruned.Capsules.Count);
        Assert.Equal(pruned.Capsules.Count, pruned.Bvh.Count);
        for (var k = 0; k < kept.Count; k++)
        {
            Assert.Equal(full.Capsules[kept[k]], pruned.Capsules[k]);
            Assert.Equal(full.Groups[kept[k]], pruned.Groups[k]);
            Assert.Equal(full.Kinds[kept[k]], pruned.Kinds[k]);
            Assert.Equal(full.BranchOfCapsule[kept[k]], pruned.BranchOfCapsule[k]);
        }

        Assert.DoesNotContain(pruned.BranchOfCapsule, removed.Contains);
        Assert.Equal(full.LimbCount, pruned.LimbCount);
        Assert.Equal(full.LimbOfBranch, pruned.LimbOfBranch);

        // The pruned scene's tree answers for its own capsules: where the removed wood was, it finds exactly what a
        // loop over the kept capsules finds.
        foreach (var b in removed)
        {
            var capsule = full.Capsules[b];
            var hits = Enumerable.Range(0, pruned.Capsules.Count).Where(i => CapsuleDistance.Overlaps(capsule, pruned.Capsules[i], 0)).ToList();
            Assert.Equal(hits.Count > 0, pruned.Bvh.AnyOverlap(capsule, 0));
        }
    }

    private static Vec3 ToVec(Vector3M v) => new(v.X, v.Y, v.Z);
}
