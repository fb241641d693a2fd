namespace Orchard.Core.Sequencing;

/// <summary>How <see cref="TourSolver"/> improves a tour.</summary>
public enum TourSearch
{
    /// <summary>Guided local search (Voudouris and Tsang), until the time or solution limit.</summary>
    GuidedLocalSearch,

    /// <summary>Accept improving moves only; stop at the first local optimum.</summary>
    GreedyDescent,
}
