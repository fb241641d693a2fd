using System.Collections.Concurrent;
using Orchard.Core.Collision;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Serialization;

namespace Orchard.Core.Tests.Planning;

/// <summary>
/// Success and check-count tables on a small seeded set of demo moves (one tree, 9 cuts: 45 moves),
/// in the manner of planner benchmark suites: thresholds on rates and counts, never on wall time.
/// </summary>
public sealed class PlannerStatisticsTests
{
    public static TheoryData<string> Variants => new() { "plain", "cost-aware", "greedy", "rrt-connect" };

    private static MovePlanner PlannerFor(string variant) => variant switch
    {
        "plain" => new MovePlanner(new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.Plain }), ShortcutSettings.Default),
        "cost-aware" => new MovePlanner(new RecursiveMidpointPlanner(RmpdSettings.Default), ShortcutSettings.Default),
        "greedy" => new MovePlanner(new RecursiveMidpointPlanner(RmpdSettings.Default with { Variant = PlannerMethod.Greedy }), ShortcutSettings.Default),
        _ => new MovePlanner(new RrtConnectPlanner(RrtConnectSettings.Default), ShortcutSettings.Default),
    };

    [Theory]
    [MemberData(nameof(Variants))]
    public void Each_variant_solves_most_moves_within_its_budget_and_every_path_is_free(string variant)
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var planner = PlannerFor(variant);
        var moves = DemoMoveSet.Moves;
        Assert.True(moves.Count >= 40);
        var solved = 0;
        var checks = 0L;
        for (var m = 0; m < moves.Count; m++)
        {
            var (from, to) = moves[m];
            var result = planner.Plan(from, to, checker, DeterministicRandom.ForStream(5, (ulong)m), TimeProvider.System, CancellationToken.None);
            checks += result.Statistics.CollisionChecks;
            if (!result.Success)
            {
                Assert.False(string.IsNullOrEmpty(result.Failure));
                continue;
            }

            solved++;
            Assert.Equal(from, result.Path[0]);
            Assert.Equal(to, result.Path[^1]);
            for (var i = 0; i + 1 < result.Path.Count; i++)
            {
                Assert.True(checker.IsEdgeFree(result.Path[i], result.Path[i + 1]), $"{variant} move {m}: segment {i} not free");
            }

            // Independent dense re-check (2 mm of arm travel between samples): nothing touches.
            Assert.Equal(0, DensePathCheck.Count(result.Path, checker).Bad);
        }

        var rate = (double)solved / moves.Count;
        var meanChecks = (double)checks / moves.Count;
        var (minRate, maxMeanChecks) = variant switch
        {
            "rrt-connect" => (0.97, 20_000.0),
            "cost-aware" => (0.90, 20_000.0),
            _ => (0.75, 25_000.0),
        };
        Assert.True(rate >= minRate, $"{variant}: success {rate:P1} < {minRate:P0}");
        Assert.True(meanChecks <= maxMeanChecks, $"{variant}: {meanChecks:F0} checks per move > {maxMeanChecks:F0}");
    }

    [Fact]
    public void One_seed_gives_byte_identical_paths_whatever_the_thread_count()
    {
        var moves = DemoMoveSet.Moves.Take(24).ToArray();
        var planner = PlannerFor("cost-aware");
        string PlanAll(int threads)
        {
            var results = new ConcurrentDictionary<int, string>();
            var checkers = new ThreadLocal<CollisionChecker>(() => DemoMoveSet.Cell.CreateChecker());
            Parallel.For(0, moves.Length, new ParallelOptions { MaxDegreeOfParallelism = threads }, m =>
            {
                var result = planner.Plan(moves[m].From, moves[m].To, checkers.Value!, DeterministicRandom.ForStream(9, (ulong)m), TimeProvider.System, CancellationToken.None);
                results[m] = OrchardJson.Serialize(result.Path);
            });
            return string.Join('\n', Enumerable.Range(0, moves.Length).Select(m => results[m]));
        }

        var one = PlanAll(1);
        Assert.Equal(one, PlanAll(2));
        Assert.Equal(one, PlanAll(4));
    }

    [Fact]
    public void A_free_straight_move_is_direct()
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var stow = DemoMoveSet.Cell.Profile.StowConfiguration.ToArray();
        var nudged = stow.ToArray();
        nudged[0] += 0.05; // The lift rises 5 cm: nothing in the way.
        var result = PlannerFor("cost-aware").Plan(stow, nudged, checker, new DeterministicRandom(1), TimeProvider.System, CancellationToken.None);
        Assert.True(result.Success);
        Assert.Equal(PlannerMethod.Direct, result.Method);
        Assert.Equal(2, result.Path.Count);
    }

    [Fact]
    public void A_spent_check_budget_fails_cleanly_and_the_production_planner_falls_back()
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var (from, to) = DemoMoveSet.Moves.First(m => !checker.IsEdgeFree(m.From, m.To));
        var starved = new RecursiveMidpointPlanner(RmpdSettings.Default with { MaxCollisionChecks = 5 });
        var failed = starved.Plan(from, to, checker, new DeterministicRandom(2), TimeProvider.System, CancellationToken.None);
        Assert.False(failed.Success);
        Assert.Contains("budget", failed.Failure, StringComparison.Ordinal);

        var production = new MovePlanner(MovePlannerSettings.Default with { Primary = RmpdSettings.Default with { MaxCollisionChecks = 5 } });
        var rescued = production.Plan(from, to, checker, new DeterministicRandom(2), TimeProvider.System, CancellationToken.None);
        Assert.True(rescued.Success);
        Assert.Equal(PlannerMethod.RrtConnect, rescued.Method);
    }

    [Fact]
    public void Cancellation_stops_planning()
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var (from, to) = DemoMoveSet.Moves.First(m => !checker.IsEdgeFree(m.From, m.To));
        using var cancelled = new CancellationTokenSource();
        cancelled.Cancel();
        Assert.ThrowsAny<OperationCanceledException>(() => PlannerFor("cost-aware").Plan(from, to, checker, new DeterministicRandom(3), TimeProvider.System, cancelled.Token));
        Assert.ThrowsAny<OperationCanceledException>(() => PlannerFor("rrt-connect").Plan(from, to, checker, new DeterministicRandom(3), TimeProvider.System, cancelled.Token));
    }

    [Fact]
    public void Shortcutting_never_lengthens_a_path_and_keeps_its_ends()
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var rrt = new RrtConnectPlanner(RrtConnectSettings.Default);
        foreach (var (m, (from, to)) in DemoMoveSet.Moves.Take(15).Select((x, i) => (i, x)))
        {
            var raw = rrt.Plan(from, to, checker, DeterministicRandom.ForStream(4, (ulong)m), TimeProvider.System, CancellationToken.None);
            if (!raw.Success)
            {
                continue;
            }

            var shorter = PathShortcutter.Shorten(raw.Path, new ArmMotionValidator(checker), ShortcutSettings.Default, new DeterministicRandom(5), CancellationToken.None);
            Assert.Equal(from, shorter[0]);
            Assert.Equal(to, shorter[^1]);
            Assert.True(JointSpace.PathLength(shorter) <= raw.PathLength + 1e-9);
            for (var i = 0; i + 1 < shorter.Count; i++)
            {
                Assert.True(checker.IsEdgeFree(shorter[i], shorter[i + 1]));
            }
        }
    }
}
