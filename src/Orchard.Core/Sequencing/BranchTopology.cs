using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>Parent and child branches of a (validated) scan, for deciding what wood a cut removes.</summary>
public sealed class BranchTopology
{
    private readonly int[] _parent;
    private readonly List<int>[] _children;

    public BranchTopology(TreeScan scan)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var count = scan.Branches.Count;
        var intoNode = new Dictionary<string, int>(count, StringComparer.Ordinal);
        for (var b = 0; b < count; b++)
        {
            intoNode[scan.Branches[b].ToNode] = b;
        }

        _parent = new int[count];
        _children = Enumerable.Range(0, count).Select(_ => new List<int>()).ToArray();
        for (var b = 0; b < count; b++)
        {
            _parent[b] = intoNode.TryGetValue(scan.Branches[b].FromNode, out var p) ? p : -1;
            if (_parent[b] >= 0)
            {
                _children[_parent[b]].Add(b);
            }
        }

        BranchIndex = Enumerable.Range(0, count).ToDictionary(b => scan.Branches[b].Id, StringComparer.Ordinal);
    }

    public IReadOnlyDictionary<string, int> BranchIndex { get; }

    /// <summary>True when <paramref name="ancestor"/> is on the way from <paramref name="branch"/> to the root (not itself).</summary>
    public bool IsStrictAncestor(int ancestor, int branch)
    {
        for (var b = _parent[branch]; b >= 0; b = _parent[b])
        {
            if (b == ancestor)
            {
                return true;
            }
        }

        return false;
    }

    /// <summary>
    /// Branches that fall away once cuts on the given branches are made: every branch beyond each cut
    /// branch. The cut branch itself is kept (its stub stays, and keeping the whole capsule is safe).
    /// </summary>
    public HashSet<int> FallenBeyond(IEnumerable<int> cutBranches)
    {
        var fallen = new HashSet<int>();
        var stack = new Stack<int>();
        foreach (var b in cutBranches)
        {
            foreach (var child in _children[b])
            {
                stack.Push(child);
            }
        }

        while (stack.Count > 0)
        {
            var b = stack.Pop();
            if (fallen.Add(b))
            {
                foreach (var child in _children[b])
                {
                    stack.Push(child);
                }
            }
        }

        return fallen;
    }
}
