namespace Orchard.Core.Sequencing;

/// <summary>Which method produced a tour.</summary>
public enum TourEngine
{
    /// <summary>Nothing to choose: at most one visit besides the start.</summary>
    Trivial,

    /// <summary>The OR-Tools routing solver (first solution, then guided local search).</summary>
    Routing,

    /// <summary>The exact dynamic programme (<see cref="HeldKarp"/>).</summary>
    HeldKarp,

    /// <summary>The routing search found nothing within its limits; the greedy feasible tour is returned instead.</summary>
    GreedyFallback,
}
