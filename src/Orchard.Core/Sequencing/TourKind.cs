namespace Orchard.Core.Sequencing;

/// <summary>Whether a tour comes back to its start node.</summary>
public enum TourKind
{
    /// <summary>A cycle: after the last visit the tour returns to the start, and that edge is paid.</summary>
    Closed,

    /// <summary>A path: the tour starts at the start node and ends wherever its last visit is.</summary>
    Open,
}
