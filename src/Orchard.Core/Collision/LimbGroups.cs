using Orchard.Core.Model;

namespace Orchard.Core.Collision;

/// <summary>
/// Splits a branch graph into limbs: from the root, each node continues its limb into the child branch
/// with the largest starting radius (ties: the first listed); every other child starts a new limb.
/// </summary>
internal static class LimbGroups
{
    public static int[] Assign(TreeScan scan, Dictionary<string, int> nodeIndex, out int limbCount)
    {
        var limb = new int[scan.Branches.Count];
        Array.Fill(limb, -1);
        var childrenOf = new List<int>?[scan.Nodes.Count];
        var hasParent = new bool[scan.Nodes.Count];
        for (var b = 0; b < scan.Branches.Count; b++)
        {
            var from = nodeIndex[scan.Branches[b].FromNode];
            (childrenOf[from] ??= []).Add(b);
            hasParent[nodeIndex[scan.Branches[b].ToNode]] = true;
        }

        var next = 0;
        var stack = new Stack<(int Node, int Limb)>();
        for (var n = 0; n < scan.Nodes.Count; n++)
        {
            if (!hasParent[n])
            {
                stack.Push((n, -1));
            }
        }

        while (stack.Count > 0)
        {
            var (node, incomingLimb) = stack.Pop();
            if (childrenOf[node] is not { } children)
            {
                continue;
            }

            var main = children.MaxBy(b => scan.Branches[b].FromRadiusM);
            foreach (var b in children)
            {
                if (limb[b] >= 0)
                {
                    continue; // Only in a malformed graph; validation refuses those.
                }

                limb[b] = b == main && incomingLimb >= 0 ? incomingLimb : next++;
                stack.Push((nodeIndex[scan.Branches[b].ToNode], limb[b]));
            }
        }

        limbCount = next;
        return limb;
    }
}
