using Orchard.Core.Model;

namespace Orchard.Core.Validation;

/// <summary>
/// Checks that the branch graph is one rooted tree: every node but the root has exactly one parent
/// branch, exactly one node (the trunk base) has none, and every node is reached from it (which, with
/// one parent each, also rules out cycles). Called only when every node and branch end is known.
/// </summary>
internal static class BranchGraphCheck
{
    public static void Run(IReadOnlyList<ScanNode> nodes, IReadOnlyList<Branch> branches, Dictionary<string, int> nodeIndex, ProblemCollector problems)
    {
        var parentBranch = new int[nodes.Count];
        Array.Fill(parentBranch, -1);
        var touched = new bool[nodes.Count];
        var children = new List<int>?[nodes.Count];
        for (var i = 0; i < branches.Count; i++)
        {
            var branch = branches[i];
            if (branch?.FromNode is null || branch.ToNode is null
                || !nodeIndex.TryGetValue(branch.FromNode, out var from) || !nodeIndex.TryGetValue(branch.ToNode, out var to)
                || from == to)
            {
                continue; // Already reported by the branch checks.
            }

            touched[from] = touched[to] = true;
            if (parentBranch[to] >= 0)
            {
                problems.Error($"$.branches[{i}].toNode", "graph.twoParents", $"Node '{branch.ToNode}' already has parent branch '{branches[parentBranch[to]].Id}'; in a tree each node grows from one branch (this closes a loop or merges two branches).");
                continue;
            }

            parentBranch[to] = i;
            (children[from] ??= []).Add(to);
        }

        var roots = new List<int>();
        for (var n = 0; n < nodes.Count; n++)
        {
            if (parentBranch[n] >= 0)
            {
                continue;
            }

            if (!touched[n] && nodes.Count > 1)
            {
                problems.Error($"$.nodes[{n}]", "graph.isolatedNode", $"Node '{nodes[n].Id}' is not connected to any branch.");
                continue;
            }

            roots.Add(n);
        }

        if (roots.Count == 0)
        {
            problems.Error("$.branches", "graph.noRoot", "Every node has a parent branch, so the graph has a cycle and no trunk base.");
        }
        else if (roots.Count > 1)
        {
            // The trunk base is the lowest root; every other root starts a separate part.
            var trunk = roots.MinBy(r => nodes[r].ZM);
            foreach (var r in roots.Where(r => r != trunk))
            {
                problems.Error($"$.nodes[{r}]", "graph.severalRoots", $"Node '{nodes[r].Id}' has no parent branch but is not the trunk base '{nodes[trunk].Id}': the branch graph falls into separate parts.");
            }
        }

        // Walk down from every root; a node with a parent that is never reached sits on a cycle.
        var reached = new bool[nodes.Count];
        var stack = new Stack<int>(roots);
        foreach (var r in roots)
        {
            reached[r] = true;
        }

        while (stack.Count > 0)
        {
            var n = stack.Pop();
            if (children[n] is not { } kids)
            {
                continue;
            }

            foreach (var child in kids)
            {
                if (!reached[child])
                {
                    reached[child] = true;
                    stack.Push(child);
                }
            }
        }

        for (var n = 0; n < nodes.Count; n++)
        {
            if (!reached[n] && parentBranch[n] >= 0)
            {
                var b = parentBranch[n];
                problems.Error($"$.branches[{b}]", "graph.cycle", $"Branch '{branches[b].Id}' is on a cycle (or hangs from one): node '{nodes[n].Id}' cannot be reached from the trunk base.");
            }
        }
    }
}
