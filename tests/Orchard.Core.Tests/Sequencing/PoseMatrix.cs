using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>A small stop for the lazy search's rules: node 0 the start, nodes 1…n−1 one pose of a cut each.</summary>
internal sealed class PoseMatrix
{
    public PoseMatrix(int count, IReadOnlyList<double>? serviceSeconds = null)
    {
        Nodes = Enumerable.Range(0, count)
            .Select(i => new TourNode(i == 0 ? "stow" : $"c{i}/0", i == 0 ? -1 : i, null, [0.0], serviceSeconds?[i] ?? 0, null))
            .ToArray();
        Costs = new ArcCostMatrix(count);
    }

    public TourNode[] Nodes { get; }

    public ArcCostMatrix Costs { get; }

    /// <summary>The move planned (probed too) at <paramref name="ms"/>: a time when found, a failure or given up otherwise.</summary>
    public void Planned(int from, int to, long ms)
    {
        Costs.MarkProbed(from, to);
        Costs.MarkPlanned(from, to);
        Costs[from, to] = ms;
    }
}
