namespace Orchard.Core.Sequencing;

/// <summary>
/// The wood that falls as a schedule's cuts are made, in order: each cut takes off every branch beyond
/// it (<see cref="BranchTopology.FallenBeyond"/>). Lets moves be planned through the space freed, and
/// names the cuts such a move depends on.
/// </summary>
internal sealed class FallingWood(Model.TreeScan scan, BranchTopology topology)
{
    private readonly List<int> _cuts = [];
    private readonly Dictionary<int, HashSet<int>> _fallenOf = [];

    /// <summary>Cuts made so far, in order.</summary>
    public IReadOnlyList<int> Cuts => _cuts;

    /// <summary>Every branch fallen so far.</summary>
    public HashSet<int> Fallen { get; } = [];

    public void Add(int cut)
    {
        _cuts.Add(cut);
        var fallen = FallenOf(cut);
        Fallen.UnionWith(fallen);
    }

    /// <summary>Undoes the last <see cref="Add"/> of this cut (its step was taken out again).</summary>
    public void Remove(int cut)
    {
        _cuts.Remove(cut);
        Fallen.Clear();
        foreach (var c in _cuts)
        {
            Fallen.UnionWith(FallenOf(c));
        }
    }

    /// <summary>The branches that fall when this one cut is made.</summary>
    public HashSet<int> FallenOf(int cut)
    {
        if (!_fallenOf.TryGetValue(cut, out var fallen))
        {
            fallen = topology.FallenBeyond([topology.BranchIndex[scan.Cuts[cut].BranchId]]);
            _fallenOf[cut] = fallen;
        }

        return fallen;
    }

    /// <summary>The cut made so far whose fall takes this branch, or −1.</summary>
    public int CutTaking(int branch)
    {
        foreach (var c in _cuts)
        {
            if (FallenOf(c).Contains(branch))
            {
                return c;
            }
        }

        return -1;
    }
}
