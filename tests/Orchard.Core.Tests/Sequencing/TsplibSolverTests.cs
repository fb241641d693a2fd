using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// The routing solver on TSPLIB instances (tests/data/tsplib in the repository) against the library's proven
/// optima (optima.csv; TSPLIB, Reinelt 1991). A solution limit, not a time limit, keeps every run the same.
/// </summary>
public sealed class TsplibSolverTests
{
    [Theory]
    [InlineData("eil51", 100)]
    [InlineData("berlin52", 250)]
    [InlineData("st70", 450)]
    [InlineData("kroA100", 150)]
    [InlineData("br17", 50)]
    [InlineData("ftv33", 250)]
    public void The_closed_tour_is_within_one_percent_of_the_proven_optimum(string name, long solutionLimit)
    {
        var instance = RepositoryTsplib.Instance(name);
        var optimum = RepositoryTsplib.Optima()[name];
        var problem = instance.ToProblem(TourKind.Closed);
        var tour = TourSolver.Solve(problem, new TourSolverSettings(TimeLimit: TimeSpan.FromMinutes(2), SolutionLimit: solutionLimit));

        Assert.Null(problem.FindViolation(tour.Visits));
        Assert.True(tour.TotalCost >= optimum, $"{name}: {tour.TotalCost} beats the proven optimum {optimum}; the distances are wrong");
        var gap = 100.0 * (tour.TotalCost - optimum) / optimum;
        Assert.True(gap <= 1.0, $"{name}: {tour.TotalCost} is {gap:F2} % above the optimum {optimum}");
    }

    [Theory]
    [InlineData("eil51")]
    public void The_open_path_from_node_1_lies_within_the_README_bounds(string name)
    {
        // Bounds from the README in tests/data/tsplib: closed optimum − longest edge ≤ open optimum
        // ≤ optimal tour − its longer edge at node 1 (symmetric instances); we allow the heuristic 1 % over the upper one.
        var instance = RepositoryTsplib.Instance(name);
        var optimum = RepositoryTsplib.Optima()[name];
        var tour = Orchard.Core.Sequencing.Tsplib.TsplibParser.ParseTour(File.ReadAllText(Path.Combine(RepositoryTsplib.Directory, name + ".opt.tour"))).Nodes;
        var at = tour.ToList().IndexOf(0);
        var longer = Math.Max(instance.Distance(tour[(at + tour.Count - 1) % tour.Count], 0), instance.Distance(0, tour[(at + 1) % tour.Count]));
        var lower = optimum - instance.LongestEdge();
        var upper = optimum - longer;

        var open = TourSolver.Solve(instance.ToProblem(TourKind.Open), new TourSolverSettings(TimeLimit: TimeSpan.FromMinutes(2), SolutionLimit: 300));
        Assert.InRange(open.TotalCost, lower, upper * 1.01);
    }
}
