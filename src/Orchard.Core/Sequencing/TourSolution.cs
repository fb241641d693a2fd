namespace Orchard.Core.Sequencing;

/// <summary>A feasible tour of a <see cref="TourProblem"/>.</summary>
/// <param name="Visits">Nodes in visiting order, starting with the start node; a closed tour does not repeat the start at the end.</param>
/// <param name="TotalCost">Recomputed from the matrix along <paramref name="Visits"/>, the closing arc included when the tour is closed.</param>
/// <param name="Status">Proved optimal, or feasible within the limits.</param>
/// <param name="Statistics">How it was found.</param>
public sealed record TourSolution(IReadOnlyList<int> Visits, long TotalCost, TourStatus Status, TourSolverStatistics Statistics);
