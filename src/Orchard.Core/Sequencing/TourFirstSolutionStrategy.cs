namespace Orchard.Core.Sequencing;

/// <summary>How the routing search builds its first tour before local search improves it (OR-Tools' strategies of the same names).</summary>
public enum TourFirstSolutionStrategy
{
    /// <summary>From the start, repeatedly extend the route along the cheapest arc to an unvisited node.</summary>
    PathCheapestArc,

    /// <summary>Insert each node where it costs least, cheapest insertion first.</summary>
    ParallelCheapestInsertion,

    /// <summary>Insert nodes one by one, each where it costs least.</summary>
    LocalCheapestInsertion,

    /// <summary>Clarke and Wright savings.</summary>
    Savings,

    /// <summary>Christofides' construction (a matching-based heuristic; its bound holds only for symmetric metric costs).</summary>
    Christofides,

    /// <summary>Let OR-Tools choose from the model.</summary>
    Automatic,
}
