using Orchard.Core.Randomness;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>The solver's contract apart from optimality: sizes, limits, statistics, determinism, cancellation.</summary>
public sealed class TourSolverTests
{
    private static TourProblem RandomEuclidean(ulong seed, int n, TourKind kind)
    {
        var random = new DeterministicRandom(seed);
        var points = Enumerable.Range(0, n).Select(_ => (random.NextDouble(0, 10_000), random.NextDouble(0, 10_000))).ToArray();
        return new TourProblem(TourSolverExactTests.EuclideanCosts(points), 0, kind);
    }

    [Fact]
    public void A_lone_start_and_a_single_group_are_answered_without_the_routing_solver()
    {
        var alone = TourSolver.Solve(new TourProblem([[0L]]));
        Assert.Equal([0], alone.Visits);
        Assert.Equal(TourEngine.Trivial, alone.Statistics.Engine);
        Assert.Equal(TourStatus.Optimal, alone.Status);

        // Closed: 0→1→0 costs 1 + 50, 0→2→0 costs 5 + 5; open: 0→1 costs 1.
        long[][] costs = [[0, 1, 5], [50, 0, 1], [5, 1, 0]];
        var closed = TourSolver.Solve(new TourProblem(costs, groups: [[1, 2]]));
        Assert.Equal([0, 2], closed.Visits);
        Assert.Equal(10, closed.TotalCost);
        var open = TourSolver.Solve(new TourProblem(costs, kind: TourKind.Open, groups: [[1, 2]]));
        Assert.Equal([0, 1], open.Visits);
        Assert.Equal(1, open.TotalCost);
        Assert.Equal(TourEngine.Trivial, open.Statistics.Engine);
    }

    [Fact]
    public void The_default_time_limit_is_a_fifth_of_a_second_plus_10_ms_per_node_up_to_10_s()
    {
        Assert.Equal(TimeSpan.FromMilliseconds(200), TourSolverSettings.DefaultTimeLimit(0));
        Assert.Equal(TimeSpan.FromMilliseconds(700), TourSolverSettings.DefaultTimeLimit(50));
        Assert.Equal(TimeSpan.FromSeconds(10), TourSolverSettings.DefaultTimeLimit(5000));
        Assert.Equal(TimeSpan.FromSeconds(3), new TourSolverSettings(TimeLimit: TimeSpan.FromSeconds(3)).EffectiveTimeLimit(50));
    }

    [Fact]
    public void Bad_settings_are_refused()
    {
        var problem = RandomEuclidean(1, 5, TourKind.Closed);
        Assert.Throws<ArgumentException>(() => TourSolver.Solve(problem, new TourSolverSettings(SolutionLimit: 0)));
        Assert.Throws<ArgumentException>(() => TourSolver.Solve(problem, new TourSolverSettings(TimeLimit: TimeSpan.Zero)));
        Assert.Throws<ArgumentException>(() => TourSolver.Solve(problem, new TourSolverSettings(FirstSolution: (TourFirstSolutionStrategy)99)));
    }

    [Theory]
    [MemberData(nameof(TourSolverExactTests.Kinds), MemberType = typeof(TourSolverExactTests))]
    public void A_tour_lists_every_node_once_from_the_start_and_its_cost_is_recomputed_from_the_matrix(TourKind kind)
    {
        var problem = RandomEuclidean(3, 30, kind);
        var tour = TourSolver.Solve(problem, TourSolverExactTests.Deterministic with { SolutionLimit = 50 });
        Assert.Equal(0, tour.Visits[0]);
        Assert.Equal(30, tour.Visits.Distinct().Count());
        Assert.Equal(30, tour.Visits.Count);
        Assert.Equal(problem.TourCost(tour.Visits), tour.TotalCost);
        Assert.Equal(TourEngine.Routing, tour.Statistics.Engine);
        Assert.NotNull(tour.Statistics.RoutingStatus);
    }

    [Fact]
    public void A_solution_limit_stops_the_search_there_and_gives_the_same_tour_every_time()
    {
        var problem = RandomEuclidean(4, 40, TourKind.Closed);
        var settings = TourSolverExactTests.Deterministic with { SolutionLimit = 25 };
        var first = TourSolver.Solve(problem, settings);
        var second = TourSolver.Solve(problem, settings);
        Assert.True(first.Statistics.ReachedSolutionLimit);
        Assert.Equal(25, first.Statistics.SolutionsFound);
        Assert.Equal(TourStatus.Feasible, first.Status);
        Assert.Equal(first.Visits, second.Visits);

        var longer = TourSolver.Solve(problem, TourSolverExactTests.Deterministic with { SolutionLimit = 100 });
        Assert.True(longer.TotalCost <= first.TotalCost);
    }

    [Fact]
    public void A_cancelled_token_stops_before_the_search()
    {
        var problem = RandomEuclidean(5, 20, TourKind.Open);
        Assert.Throws<OperationCanceledException>(() => TourSolver.Solve(problem, cancellationToken: new CancellationToken(canceled: true)));
    }

    /// <summary>
    /// Cancelling mid-search must stop the routing search: with a five-minute time limit and no solution limit,
    /// only the cancellation can end it. The one-minute wait is a liveness guard against a hang, not a speed
    /// check.
    /// </summary>
    [Fact]
    public async Task Cancelling_during_the_search_stops_it()
    {
        var problem = RandomEuclidean(6, 150, TourKind.Closed);
        using var cancel = new CancellationTokenSource();
        var solving = Task.Run(() => TourSolver.Solve(problem, new TourSolverSettings(TimeLimit: TimeSpan.FromMinutes(5)), cancel.Token));
        await Task.Delay(300);
        await cancel.CancelAsync();
        var finished = await Task.WhenAny(solving, Task.Delay(TimeSpan.FromMinutes(1)));
        Assert.True(finished == solving, "the search went on after cancellation");
        await Assert.ThrowsAnyAsync<OperationCanceledException>(() => solving);
    }
}
