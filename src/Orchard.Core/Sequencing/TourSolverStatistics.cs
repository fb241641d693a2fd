namespace Orchard.Core.Sequencing;

/// <summary>How a tour was found.</summary>
/// <param name="Engine">The method that produced the tour.</param>
/// <param name="SolutionsFound">Solutions the search accepted on its way (first solution and every local-search move it took); 1 for the trivial and exact engines.</param>
/// <param name="ReachedSolutionLimit">True when the search stopped because it reached <see cref="TourSolverSettings.SolutionLimit"/>.</param>
/// <param name="RoutingStatus">The routing solver's own status word (e.g. <c>RoutingSuccess</c>), or null when it did not run.</param>
public sealed record TourSolverStatistics(TourEngine Engine, long SolutionsFound, bool ReachedSolutionLimit, string? RoutingStatus);
