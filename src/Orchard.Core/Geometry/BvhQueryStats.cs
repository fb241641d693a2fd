namespace Orchard.Core.Geometry;

/// <summary>
/// Work counters that <see cref="CapsuleBvh"/> queries add to (passed by <c>ref</c>, so one instance can total many
/// queries without allocating). Start from <c>default</c>.
/// </summary>
public struct BvhQueryStats
{
    /// <summary>Number of queries that added to these counters.</summary>
    public long Queries { get; set; }

    /// <summary>Tree nodes opened (popped and not pruned).</summary>
    public long NodesVisited { get; set; }

    /// <summary>Exact capsule–capsule tests (segment closest-point computations).</summary>
    public long PairTests { get; set; }

    public readonly override string ToString() => $"queries={Queries} nodes={NodesVisited} pairTests={PairTests}";
}
