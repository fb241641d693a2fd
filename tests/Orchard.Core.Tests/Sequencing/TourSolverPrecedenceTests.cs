using Orchard.Core.Randomness;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>Precedences through the counting dimension and rank expressions, under the routing local search.</summary>
public sealed class TourSolverPrecedenceTests
{
    private static readonly TourSolverSettings Deterministic = TourSolverExactTests.Deterministic;

    [Theory]
    [MemberData(nameof(TourSolverExactTests.Kinds), MemberType = typeof(TourSolverExactTests))]
    public void Random_precedence_DAGs_are_never_broken_and_the_optimum_is_Held_Karps(TourKind kind)
    {
        for (ulong seed = 300; seed < 320; seed++)
        {
            var random = new DeterministicRandom(seed);
            var n = random.NextInt(5, 13);
            var start = random.NextInt(n);
            var groups = seed % 2 == 0 ? RandomProblems.Singletons(n, start) : RandomProblems.RandomGroups(random, n, start, 3);
            var precedences = RandomProblems.RandomDag(random, groups.Length, random.NextDouble(0.05, 0.4));
            var problem = new TourProblem(RandomProblems.AsymmetricCosts(random, n), start, kind, groups, precedences);
            var routed = TourSolver.Solve(problem, Deterministic);
            Assert.Null(problem.FindViolation(routed.Visits));
            var exact = HeldKarp.Solve(problem);
            Assert.True(exact.TotalCost == routed.TotalCost, $"seed {seed}, {n} nodes, {precedences.Length} precedences, {kind}: routing {routed.TotalCost}, Held–Karp {exact.TotalCost}");
        }
    }

    [Fact]
    public void A_larger_instance_with_many_precedences_stays_feasible_and_improves_on_the_greedy_tour()
    {
        var random = new DeterministicRandom(77);
        const int n = 40;
        var points = Enumerable.Range(0, n).Select(_ => (random.NextDouble(0, 1000), random.NextDouble(0, 1000))).ToArray();
        var groups = RandomProblems.Singletons(n, 0);
        var problem = new TourProblem(TourSolverExactTests.EuclideanCosts(points), 0, TourKind.Open, groups, RandomProblems.RandomDag(random, groups.Length, 0.03));
        var routed = TourSolver.Solve(problem, TourSolverExactTests.Quick);
        Assert.Equal(TourEngine.Routing, routed.Statistics.Engine);
        Assert.Null(problem.FindViolation(routed.Visits));
        Assert.True(routed.TotalCost < problem.TourCost(GreedyTour.Build(problem)), "local search should improve on nearest feasible neighbour");
    }

    /// <summary>
    /// Seven points on a line at 0, 10, …, 60, starting at 0: the best open path walks out in order (60), the
    /// best closed tour out and back (120), picking up any node on either leg. Asking for 60, then 10, then 50
    /// forces a zig-zag; brute force over all orders gives its cost, and
    /// the solver must match it.
    /// </summary>
    [Theory]
    [MemberData(nameof(TourSolverExactTests.Kinds), MemberType = typeof(TourSolverExactTests))]
    public void A_precedence_that_forces_a_worse_order_is_kept_and_costs_what_brute_force_says(TourKind kind)
    {
        var points = Enumerable.Range(0, 7).Select(i => (i * 10.0, 0.0)).ToArray();
        var costs = TourSolverExactTests.EuclideanCosts(points);
        var groups = RandomProblems.Singletons(7, 0); // Group g holds node g + 1.
        var free = new TourProblem(costs, 0, kind, groups);
        var forced = new TourProblem(costs, 0, kind, groups, [new GroupPrecedence(Before: 5, After: 0), new GroupPrecedence(Before: 0, After: 4)]);

        var freeOptimum = BruteForce.OptimalCost(free);
        var forcedOptimum = BruteForce.OptimalCost(forced);
        Assert.True(forcedOptimum > freeOptimum, "the precedence must make the best tour worse, or this test shows nothing");

        var routed = TourSolver.Solve(forced, Deterministic);
        Assert.Null(forced.FindViolation(routed.Visits));
        var position = routed.Visits.ToList();
        Assert.True(position.IndexOf(6) < position.IndexOf(1) && position.IndexOf(1) < position.IndexOf(5));
        Assert.Equal(forcedOptimum, routed.TotalCost);
        Assert.Equal(forcedOptimum, HeldKarp.Solve(forced).TotalCost);
        Assert.Equal(freeOptimum, TourSolver.Solve(free, Deterministic).TotalCost);
    }

    /// <summary>
    /// A group of two alternatives that must come before a far node F: alternative A lies beyond F and is the
    /// free choice (visit F, then A); alternative B lies off to the side before F. The precedence makes the
    /// solver take B. Brute force decides the cost.
    /// </summary>
    [Fact]
    public void A_precedence_on_a_group_of_alternatives_picks_the_alternative_that_keeps_it()
    {
        // Start 0 at the origin, F = node 1 at x=50, A = node 2 at x=80, B = node 3 at (25, 35).
        (double, double)[] points = [(0, 0), (50, 0), (80, 0), (25, 35)];
        var costs = TourSolverExactTests.EuclideanCosts(points);
        int[][] groups = [[1], [2, 3]];
        var free = new TourProblem(costs, 0, TourKind.Open, groups);
        var forced = new TourProblem(costs, 0, TourKind.Open, groups, [new GroupPrecedence(Before: 1, After: 0)]);

        var freeTour = TourSolver.Solve(free, Deterministic);
        Assert.Equal(BruteForce.OptimalCost(free), freeTour.TotalCost);
        Assert.Contains(2, freeTour.Visits);

        var forcedTour = TourSolver.Solve(forced, Deterministic);
        Assert.Null(forced.FindViolation(forcedTour.Visits));
        Assert.Equal(BruteForce.OptimalCost(forced), forcedTour.TotalCost);
        Assert.Equal([0, 3, 1], forcedTour.Visits);
    }
}
