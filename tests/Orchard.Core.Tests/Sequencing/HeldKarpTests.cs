using CsCheck;
using Orchard.Core.Randomness;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

public sealed class HeldKarpTests
{
    /// <summary>A random problem of 1–8 nodes: plain, with groups, and/or with precedences, open or closed.</summary>
    private static TourProblem SmallProblem(ulong seed)
    {
        var random = new DeterministicRandom(seed);
        var n = random.NextInt(1, 9);
        var start = random.NextInt(n);
        var kind = random.NextBool(0.5) ? TourKind.Open : TourKind.Closed;
        var costs = RandomProblems.AsymmetricCosts(random, n, maxCost: random.NextBool(0.3) ? 5 : 100); // Small ranges make ties.
        var groups = random.NextBool(0.5) ? RandomProblems.RandomGroups(random, n, start, 3) : RandomProblems.Singletons(n, start);
        var precedences = random.NextBool(0.6) ? RandomProblems.RandomDag(random, groups.Length, random.NextDouble(0.1, 0.6)) : [];
        return new TourProblem(costs, start, kind, groups, precedences);
    }

    [Fact]
    public void Matches_brute_force_over_all_permutations_on_random_problems_of_up_to_8_nodes()
    {
        Gen.ULong.Sample(seed =>
        {
            var problem = SmallProblem(seed);
            var exact = HeldKarp.Solve(problem);
            Assert.Null(problem.FindViolation(exact.Visits));
            Assert.Equal(problem.TourCost(exact.Visits), exact.TotalCost);
            Assert.Equal(BruteForce.OptimalCost(problem), exact.TotalCost);
            Assert.Equal(TourStatus.Optimal, exact.Status);
        }, iter: 400);
    }

    [Fact]
    public void A_lone_start_is_a_tour_of_cost_zero()
    {
        var exact = HeldKarp.Solve(new TourProblem([[0L]]));
        Assert.Equal([0], exact.Visits);
        Assert.Equal(0, exact.TotalCost);
    }

    [Fact]
    public void Refuses_more_nodes_than_it_can_tabulate()
    {
        var n = HeldKarp.MaxNodeCount + 1;
        var problem = new TourProblem(RandomProblems.AsymmetricCosts(new DeterministicRandom(1), n));
        var ex = Assert.Throws<ArgumentException>(() => HeldKarp.Solve(problem));
        Assert.Contains($"at most {HeldKarp.MaxNodeCount} nodes", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Handles_its_largest_size_and_honours_a_cancelled_token()
    {
        var problem = new TourProblem(RandomProblems.AsymmetricCosts(new DeterministicRandom(2), HeldKarp.MaxNodeCount), kind: TourKind.Open);
        var exact = HeldKarp.Solve(problem);
        Assert.Null(problem.FindViolation(exact.Visits));
        Assert.Equal(HeldKarp.MaxNodeCount, exact.Visits.Count);
        Assert.Throws<OperationCanceledException>(() => HeldKarp.Solve(problem, new CancellationToken(canceled: true)));
    }
}
