namespace Orchard.Core.Sequencing;

/// <summary>Limits and strategy for <see cref="TourSolver"/>.</summary>
/// <param name="TimeLimit">
/// Budget for the routing search (OR-Tools measures it). Null uses <see cref="DefaultTimeLimit"/>:
/// 0.2 s + 10 ms per node, capped at 10 s (0.7 s for 50 cuts, 2.2 s for 200).
/// </param>
/// <param name="SolutionLimit">
/// Stop after the search has accepted this many solutions; null for no such limit. Guided local search never
/// stops on its own, so a run with a solution limit that the time limit does not cut short is deterministic:
/// tests set one with a generous time limit.
/// </param>
/// <param name="FirstSolution">
/// How the first tour is built; guided local search then improves it. Default <c>PathCheapestArc</c>. Problems
/// with precedences ignore it and start from the greedy feasible tour (nearest neighbour among the groups
/// whose predecessors are visited).
/// </param>
/// <param name="Search">
/// How the first tour is improved: guided local search until a limit (the default), or greedy descent, which
/// stops at the first local optimum of OR-Tools' neighbourhoods (fast and deterministic without a limit).
/// </param>
/// <param name="InitialVisits">
/// A tour to start from instead of building a first one (a warm start): the start node first, then one node
/// of each group; null to build one.
/// </param>
public sealed record TourSolverSettings(
    TimeSpan? TimeLimit = null,
    long? SolutionLimit = null,
    TourFirstSolutionStrategy FirstSolution = TourFirstSolutionStrategy.PathCheapestArc,
    TourSearch Search = TourSearch.GuidedLocalSearch,
    IReadOnlyList<int>? InitialVisits = null)
{
    /// <summary>Fixed part of the default time limit.</summary>
    public static readonly TimeSpan BaseTimeLimit = TimeSpan.FromMilliseconds(200);

    /// <summary>Default time limit added per node of the problem.</summary>
    public static readonly TimeSpan TimeLimitPerNode = TimeSpan.FromMilliseconds(10);

    /// <summary>The default time limit never exceeds this.</summary>
    public static readonly TimeSpan MaxDefaultTimeLimit = TimeSpan.FromSeconds(10);

    /// <summary>0.2 s + 10 ms × <paramref name="nodeCount"/>, at most 10 s.</summary>
    public static TimeSpan DefaultTimeLimit(int nodeCount)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(nodeCount);
        var limit = BaseTimeLimit + (TimeLimitPerNode * nodeCount);
        return limit < MaxDefaultTimeLimit ? limit : MaxDefaultTimeLimit;
    }

    /// <summary>The time limit a problem of <paramref name="nodeCount"/> nodes is solved under.</summary>
    public TimeSpan EffectiveTimeLimit(int nodeCount) => TimeLimit ?? DefaultTimeLimit(nodeCount);
}
