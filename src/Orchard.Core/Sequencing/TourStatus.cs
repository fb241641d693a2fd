namespace Orchard.Core.Sequencing;

/// <summary>What is known about a tour's quality. Every returned tour is feasible.</summary>
public enum TourStatus
{
    /// <summary>Proved optimal: a trivial size, the exact solver, or the routing search reported optimality.</summary>
    Optimal,

    /// <summary>Feasible; the search stopped at its time or solution limit, so optimality is not proved.</summary>
    Feasible,
}
