using Orchard.Core.Collision;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Planning;

/// <summary>
/// <see cref="MovePlanner.Join"/>: two found moves through the pose between them make one move from the
/// first's start to the second's end, every segment free, never longer than the two together.
/// </summary>
public sealed class JoinTests
{
    [Fact]
    public void Two_found_moves_join_into_one_free_move_no_longer_than_both()
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var planner = new MovePlanner(MovePlannerSettings.Default);
        var stow = DemoMoveSet.Cell.Profile.StowConfiguration.ToArray();
        var targets = DemoMoveSet.Moves.Where(m => m.From.AsSpan().SequenceEqual(stow)).Select(m => m.To).ToList();
        var joined = 0;
        for (var k = 0; k + 1 < targets.Count; k++)
        {
            // stow → target k, then target k → target k + 1: joined, stow → target k + 1 through target k.
            var first = planner.Plan(stow, targets[k], checker, DeterministicRandom.ForStream(7, (ulong)k), TimeProvider.System, CancellationToken.None);
            var second = planner.Plan(targets[k], targets[k + 1], checker, DeterministicRandom.ForStream(8, (ulong)k), TimeProvider.System, CancellationToken.None);
            if (!first.Success || !second.Success)
            {
                continue;
            }

            var result = planner.Join(first.Path, second.Path, new ArmMotionValidator(checker), DeterministicRandom.ForStream(9, (ulong)k), TimeProvider.System, CancellationToken.None);
            Assert.True(result.Success);
            Assert.Equal(PlannerMethod.Via, result.Method);
            Assert.Equal(stow, result.Path[0]);
            Assert.Equal(targets[k + 1], result.Path[^1]);
            for (var i = 0; i + 1 < result.Path.Count; i++)
            {
                Assert.True(checker.IsEdgeFree(result.Path[i], result.Path[i + 1]), $"join {k}: segment {i} not free");
            }

            Assert.Equal(0, DensePathCheck.Count(result.Path, checker).Bad);
            Assert.True(result.PathLength <= first.PathLength + second.PathLength + 1e-9, $"join {k}: {result.PathLength} longer than {first.PathLength} + {second.PathLength}");
            joined++;
        }

        Assert.True(joined >= 5, $"only {joined} pairs of found moves to join");
    }

    [Fact]
    public void Paths_that_do_not_meet_are_refused()
    {
        var checker = DemoMoveSet.Cell.CreateChecker();
        var planner = new MovePlanner(MovePlannerSettings.Default);
        var (a, b) = DemoMoveSet.Moves[0];
        var c = DemoMoveSet.Moves[1].To;
        Assert.Throws<ArgumentException>(() => planner.Join([a, b], [c, a], new ArmMotionValidator(checker), DeterministicRandom.ForStream(1, 1), TimeProvider.System, CancellationToken.None));
    }
}
