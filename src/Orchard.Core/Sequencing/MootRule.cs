using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>
/// The precedence rule from the branch hierarchy. A cut removes all wood beyond it: on its own branch
/// further from the root, and on every branch growing from there. So cut X is <b>moot</b> when another
/// cut Y that will be (or was) made sits between X and the root: Y's branch is an ancestor of X's, or
/// both are on one branch with Y nearer the root (at the same place, the first listed counts).
/// With <see cref="MootPolicy.Drop"/> moot cuts are left out; with <see cref="MootPolicy.CutFirst"/>
/// they stay, with the rule X before Y. Either way no schedule makes Y and then X.
/// </summary>
public static class MootRule
{
    /// <summary>For each moot cut (index into the scan's cuts), the active cut nearest the root that removes it.</summary>
    public static Dictionary<int, int> Find(TreeScan scan, BranchTopology topology, IReadOnlyCollection<int> activeCuts)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(topology);
        ArgumentNullException.ThrowIfNull(activeCuts);
        var moot = new Dictionary<int, int>();
        foreach (var x in activeCuts)
        {
            foreach (var y in activeCuts)
            {
                if (x != y && Removes(scan, topology, y, x) && (!moot.TryGetValue(x, out var current) || Removes(scan, topology, y, current)))
                {
                    moot[x] = y;
                }
            }
        }

        return moot;
    }

    /// <summary>Does cut <paramref name="y"/> take off the wood cut <paramref name="x"/> is on?</summary>
    public static bool Removes(TreeScan scan, BranchTopology topology, int y, int x)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(topology);
        var cx = scan.Cuts[x];
        var cy = scan.Cuts[y];
        var bx = topology.BranchIndex[cx.BranchId];
        var by = topology.BranchIndex[cy.BranchId];
        if (bx == by)
        {
            return cy.PositionAlong < cx.PositionAlong || (cy.PositionAlong == cx.PositionAlong && y < x);
        }

        return topology.IsStrictAncestor(by, bx);
    }
}
