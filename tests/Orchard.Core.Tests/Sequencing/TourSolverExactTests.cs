using Orchard.Core.Randomness;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>The routing solver against answers known exactly: Held–Karp, and instances whose optimum follows from geometry.</summary>
public sealed class TourSolverExactTests
{
    /// <summary>A solution limit, not a time limit, so every run is the same run; the time limit is only a safety net.</summary>
    internal static readonly TourSolverSettings Deterministic = new(TimeLimit: TimeSpan.FromMinutes(2), SolutionLimit: 300);

    /// <summary>Fewer solutions for the larger geometric instances, whose optimum local search finds early.</summary>
    internal static readonly TourSolverSettings Quick = Deterministic with { SolutionLimit = 100 };

    public static TheoryData<TourKind> Kinds => [TourKind.Closed, TourKind.Open];

    [Theory]
    [MemberData(nameof(Kinds))]
    public void Equals_the_Held_Karp_optimum_on_24_random_asymmetric_instances_of_up_to_12_nodes(TourKind kind)
    {
        for (ulong seed = 1; seed <= 24; seed++)
        {
            var random = new DeterministicRandom(seed);
            var n = random.NextInt(5, 13);
            var problem = new TourProblem(RandomProblems.AsymmetricCosts(random, n), random.NextInt(n), kind);
            var exact = HeldKarp.Solve(problem);
            var routed = TourSolver.Solve(problem, Deterministic);
            Assert.Null(problem.FindViolation(routed.Visits));
            Assert.True(exact.TotalCost == routed.TotalCost, $"seed {seed}, {n} nodes, {kind}: routing {routed.TotalCost}, Held–Karp {exact.TotalCost}");
        }
    }

    [Theory]
    [MemberData(nameof(Kinds))]
    public void Equals_the_Held_Karp_optimum_on_random_generalised_instances_with_groups_of_up_to_3(TourKind kind)
    {
        for (ulong seed = 100; seed < 116; seed++)
        {
            var random = new DeterministicRandom(seed);
            var n = random.NextInt(6, 13);
            var start = random.NextInt(n);
            var problem = new TourProblem(RandomProblems.AsymmetricCosts(random, n), start, kind, RandomProblems.RandomGroups(random, n, start, 3));
            var exact = HeldKarp.Solve(problem);
            var routed = TourSolver.Solve(problem, Deterministic);
            Assert.Null(problem.FindViolation(routed.Visits));
            Assert.True(exact.TotalCost == routed.TotalCost, $"seed {seed}, {n} nodes in {problem.VisitSets.Count} groups, {kind}: routing {routed.TotalCost}, Held–Karp {exact.TotalCost}");
        }
    }

    /// <summary>
    /// k points evenly on a circle, in shuffled node order. Every arc between distinct points is at least one
    /// side long (rounded: at least nint(side)), and going round uses only sides, so the closed optimum is
    /// k·nint(side) and the open optimum from any point (k − 1)·nint(side). Elementary geometry.
    /// </summary>
    [Theory]
    [InlineData(7, 1000.0, 1UL)]
    [InlineData(12, 2500.0, 2UL)]
    [InlineData(25, 10000.0, 3UL)]
    [InlineData(40, 10000.0, 4UL)]
    public void Points_on_a_circle_cost_the_polygon_perimeter_closed_and_one_side_less_open(int k, double radius, ulong seed)
    {
        var random = new DeterministicRandom(seed);
        var order = RandomProblems.Shuffled(random, k);
        var phase = random.NextDouble(0, Math.PI);
        var points = new (double X, double Y)[k];
        for (var i = 0; i < k; i++)
        {
            var angle = phase + (2 * Math.PI * order[i] / k);
            points[i] = (radius * Math.Cos(angle), radius * Math.Sin(angle));
        }

        var side = (long)((2 * radius * Math.Sin(Math.PI / k)) + 0.5);
        var costs = EuclideanCosts(points);
        var start = random.NextInt(k);
        var closed = TourSolver.Solve(new TourProblem(costs, start, TourKind.Closed), Quick);
        var open = TourSolver.Solve(new TourProblem(costs, start, TourKind.Open), Quick);
        Assert.Equal(k * side, closed.TotalCost);
        Assert.Equal((k - 1) * side, open.TotalCost);
    }

    /// <summary>
    /// An m×n grid of spacing s with m·n even has a Hamiltonian cycle along grid edges (a boustrophedon closed
    /// down one column), and every arc is at least s, so the closed optimum is m·n·s; cutting that cycle at
    /// any start gives the open optimum (m·n − 1)·s.
    /// </summary>
    [Theory]
    [InlineData(3, 4, 10)]
    [InlineData(4, 5, 7)]
    [InlineData(4, 6, 13)]
    public void An_even_grid_costs_one_spacing_per_point(int rows, int columns, int spacing)
    {
        var points = new (double X, double Y)[rows * columns];
        for (var r = 0; r < rows; r++)
        {
            for (var c = 0; c < columns; c++)
            {
                points[(r * columns) + c] = (c * spacing, r * spacing);
            }
        }

        var costs = EuclideanCosts(points);
        var start = (rows * columns) / 3;
        var closed = TourSolver.Solve(new TourProblem(costs, start, TourKind.Closed), Quick);
        var open = TourSolver.Solve(new TourProblem(costs, start, TourKind.Open), Quick);
        Assert.Equal((long)rows * columns * spacing, closed.TotalCost);
        Assert.Equal(((long)rows * columns - 1) * spacing, open.TotalCost);
    }

    /// <summary>
    /// Each of 6 nodes gets a copy whose every arc costs k more; {node, copy} is a group. Any tour through a
    /// copy pays at least k extra, so the generalised optimum is the plain optimum and uses no copy.
    /// </summary>
    [Theory]
    [MemberData(nameof(Kinds))]
    public void Dominated_copies_leave_the_optimum_unchanged_and_are_never_chosen(TourKind kind)
    {
        const int k = 40;
        for (ulong seed = 200; seed < 206; seed++)
        {
            var random = new DeterministicRandom(seed);
            const int n = 7;
            var plainCosts = RandomProblems.AsymmetricCosts(random, n);
            var plain = new TourProblem(plainCosts, 0, kind);
            var plainOptimum = HeldKarp.Solve(plain).TotalCost;

            // Node v (1..6) has its copy at v + 6; the start (0) has none.
            var size = (2 * n) - 1;
            int Original(int v) => v < n ? v : v - (n - 1);
            var costs = new long[size][];
            for (var i = 0; i < size; i++)
            {
                costs[i] = new long[size];
                for (var j = 0; j < size; j++)
                {
                    costs[i][j] = i == j ? 0 : plainCosts[Original(i)][Original(j)] + (i >= n || j >= n ? k : 0);
                }
            }

            var groups = Enumerable.Range(1, n - 1).Select(v => new[] { v, v + n - 1 }).ToArray();
            var generalised = new TourProblem(costs, 0, kind, groups);
            var routed = TourSolver.Solve(generalised, Deterministic);
            Assert.Null(generalised.FindViolation(routed.Visits));
            Assert.Equal(plainOptimum, routed.TotalCost);
            Assert.All(routed.Visits, v => Assert.True(v < n, $"seed {seed}: copy {v} chosen in {string.Join(",", routed.Visits)}"));
            Assert.Equal(plainOptimum, HeldKarp.Solve(generalised).TotalCost);
        }
    }

    internal static long[][] EuclideanCosts((double X, double Y)[] points) =>
        [.. points.Select(p => points.Select(q => (long)(Math.Sqrt(((p.X - q.X) * (p.X - q.X)) + ((p.Y - q.Y) * (p.Y - q.Y))) + 0.5)).ToArray())];
}
