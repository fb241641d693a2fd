using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Core.Timing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>Invariants of schedules planned for demo trees (trimmed to a dozen cuts to keep the suite quick).</summary>
public sealed class SchedulePropertyTests
{
    private static readonly ArmProfile Arm = DemoArm.Create();

    private static TreeScan Trimmed(int tree, int cuts)
    {
        var scan = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 2)).Trees[tree].Scan;
        return scan with { Cuts = scan.Cuts.Take(cuts).ToArray() };
    }

    private static readonly Lazy<(TreeScan Scan, Schedule Schedule, TreePlanState State)> First = new(() =>
    {
        var scan = Trimmed(0, 12);
        var (schedule, state) = TreeSequencer.Plan(scan, Arm, SequencingSettings.Default, TimeProvider.System, CancellationToken.None);
        return (scan, schedule, state);
    });

    [Fact]
    public void Every_cut_is_either_scheduled_once_or_listed_as_left_out_with_a_reason()
    {
        var (scan, schedule, _) = First.Value;
        var scheduled = Steps(schedule).Select(s => s.CutId).ToList();
        Assert.Equal(scheduled.Count, scheduled.Distinct().Count());
        var all = scheduled.Concat(schedule.Unscheduled.Select(u => u.CutId)).Order(StringComparer.Ordinal);
        Assert.Equal(scan.Cuts.Select(c => c.Id).Order(StringComparer.Ordinal), all);
        Assert.All(schedule.Unscheduled, u => Assert.False(string.IsNullOrWhiteSpace(u.Detail)));
        Assert.All(schedule.Unscheduled.Where(u => u.Status == UnscheduledStatus.Unreachable), u => Assert.NotNull(u.Reason));
        Assert.True(Steps(schedule).Count >= 8, "most cuts of a demo tree are scheduled");
        Assert.Equal(ScheduleStatus.Complete, schedule.Status);
        Assert.Equal(Steps(schedule).Select((s, i) => i + 1), Steps(schedule).Select(s => s.Sequence));
        Assert.Equal(schedule.Stops.Select((s, i) => i + 1), schedule.Stops.Select(s => s.Sequence));
    }

    [Fact]
    public void Every_stop_starts_stowed_each_travel_runs_clear_pose_to_clear_pose_and_the_stop_ends_at_stow()
    {
        var (_, schedule, _) = First.Value;
        foreach (var stop in schedule.Stops)
        {
            Assert.Equal(Arm.StowConfiguration, stop.StartConfiguration);
            Assert.Empty(stop.Retreat);
            var at = stop.StartConfiguration.ToArray();
            foreach (var step in stop.Steps)
            {
                AssertClose(at, step.Travel[0].Positions);
                AssertClose(step.ClearConfiguration, step.Travel[^1].Positions);
                AssertClose(step.ClearConfiguration, step.Approach[0].Positions);
                AssertClose(step.CutConfiguration, step.Approach[^1].Positions);
                Assert.InRange(step.PreCutSecond, 0, step.ApproachSeconds);
                Assert.True(KnotContract.LargestResidual(step.Travel) <= 1e-9 && KnotContract.LargestResidual(step.Approach) <= 1e-9, "knots follow the contract");
                at = step.ClearConfiguration.ToArray(); // The retract runs the approach backwards.
            }

            Assert.NotEqual("none", stop.ReturnMethod);
            AssertClose(at, stop.ReturnToStow[0].Positions);
            AssertClose(Arm.StowConfiguration, stop.ReturnToStow[^1].Positions);
        }
    }

    [Fact]
    public void Times_add_up()
    {
        var (scan, schedule, _) = First.Value;
        var clock = 0.0;
        var travel = 0.0;
        var platform = 0.0;
        StopSide? side = null;
        foreach (var stop in schedule.Stops)
        {
            Assert.True(side != stop.Side || stop.PlatformMoveSeconds > 0, "a second stop on the same side costs a platform move");
            Assert.True(side == stop.Side || stop.PlatformMoveSeconds == 0, "the first stop of a side is reached with the row's own travel");
            side = stop.Side;
            clock += stop.PlatformMoveSeconds;
            platform += stop.PlatformMoveSeconds;
            Assert.Equal(clock, stop.StartSecond, 6);
            clock += stop.RetreatSeconds;
            foreach (var step in stop.Steps)
            {
                Assert.Equal(clock, step.StartSecond, 5);
                Assert.Equal(step.TravelSeconds, step.Travel[^1].TimeS, 9);
                Assert.Equal(step.ApproachSeconds, step.Approach[^1].TimeS, 9);
                Assert.Equal(step.ApproachSeconds, step.RetractSeconds);
                var cut = scan.Cuts.Single(c => c.Id == step.CutId);
                Assert.Equal(Arm.CutTime.SecondsFor(cut.DiameterMm), step.CutSeconds, 12);
                Assert.True(step.TravelSeconds >= 0 && step.ApproachSeconds > 0);
                clock = step.EndSecond;
                travel += step.TravelSeconds;
            }

            Assert.Equal(stop.ReturnSeconds, stop.ReturnToStow.Count == 0 ? 0 : stop.ReturnToStow[^1].TimeS, 9);
            clock += stop.ReturnSeconds;
            Assert.Equal(clock, stop.EndSecond, 6);
        }

        Assert.Equal(travel, schedule.TravelSeconds, 6);
        Assert.Equal(clock, schedule.TotalSeconds, 6);
        Assert.Equal(platform, schedule.PlatformSeconds, 6);
        Assert.Equal(schedule.TotalSeconds, schedule.ArmSeconds + schedule.PlatformSeconds, 6);
    }

    [Fact]
    public void No_cut_comes_after_a_cut_that_removes_its_wood()
    {
        var (scan, schedule, _) = First.Value;
        var topology = new BranchTopology(scan);
        var index = scan.Cuts.Select((c, i) => (c.Id, i)).ToDictionary(p => p.Id, p => p.i);
        var order = Steps(schedule).Select(s => index[s.CutId]).ToList();
        for (var a = 0; a < order.Count; a++)
        {
            for (var b = a + 1; b < order.Count; b++)
            {
                Assert.False(MootRule.Removes(scan, topology, order[a], order[b]), $"{scan.Cuts[order[a]].Id} removes the wood of the later {scan.Cuts[order[b]].Id}");
            }
        }
    }

    [Fact]
    public void Lazy_evaluation_plans_a_small_share_of_all_pairs()
    {
        var stats = First.Value.Schedule.Statistics;
        Assert.Equal("lazy", stats.Mode);
        Assert.True(stats.EdgesPlanned < stats.EdgesAllPairs / 3, $"{stats.EdgesPlanned} of {stats.EdgesAllPairs}");
        Assert.True(stats.SolverRounds >= 1);
        Assert.True(stats.StandsAnalysed >= 1);
    }

    [Fact]
    public void One_seed_gives_the_same_schedule()
    {
        var scan = Trimmed(1, 6);
        string Once() => OrchardJson.Serialize(TreeSequencer.Plan(scan, Arm, SequencingSettings.Default with { Parallelism = 2 }, TimeProvider.System, CancellationToken.None).Schedule with { Statistics = null! });
        Assert.Equal(Once(), Once());
    }

    [Theory]
    [InlineData(RetryPolicy.RetryNow)]
    [InlineData(RetryPolicy.RetryLast)]
    [InlineData(RetryPolicy.Drop)]
    public void A_replan_never_repeats_a_done_cut_and_follows_the_retry_policy(RetryPolicy policy)
    {
        var (scan, schedule, state) = First.Value;
        var steps = Steps(schedule);
        var done = steps.Take(2).Select(s => s.CutId).ToArray();
        var missed = steps[2].CutId;
        var stop = schedule.Stops.Single(s => s.Steps.Any(x => x.CutId == missed));
        var here = steps[2].PreCutConfiguration;
        var request = new ReplanRequest(here, done, [], missed, policy, stop.ArmBase);
        var (next, _) = TreeSequencer.Replan(scan, Arm, state, request, 2, SequencingSettings.Default, TimeProvider.System, CancellationToken.None);

        Assert.Equal(2, next.Version);
        Assert.Equal(stop.ArmBase, next.Stops[0].ArmBase);
        Assert.Equal(here, next.Stops[0].StartConfiguration);
        Assert.DoesNotContain(Steps(next), s => done.Contains(s.CutId));
        Assert.All(done, d => Assert.Contains(next.Unscheduled, u => u.CutId == d && u.Status == UnscheduledStatus.Done));
        var firstMove = next.Stops[0].Retreat.Count > 0 ? next.Stops[0].Retreat : next.Stops[0].Steps.Count > 0 ? next.Stops[0].Steps[0].Travel : next.Stops[0].ReturnToStow;
        AssertClose(here, firstMove[0].Positions);
        switch (policy)
        {
            case RetryPolicy.RetryNow:
                Assert.Equal(missed, Steps(next)[0].CutId);
                break;
            case RetryPolicy.RetryLast:
                Assert.Equal(missed, next.Stops[0].Steps[^1].CutId);
                break;
            default:
                Assert.DoesNotContain(Steps(next), s => s.CutId == missed);
                Assert.Contains(next.Unscheduled, u => u.CutId == missed && u.Status == UnscheduledStatus.Dropped);
                break;
        }

        // Everything still to do is there: the first schedule's remaining cuts, less the dropped one.
        var expected = steps.Skip(2).Select(s => s.CutId).Where(c => policy != RetryPolicy.Drop || c != missed).Order(StringComparer.Ordinal);
        Assert.True(expected.SequenceEqual(Steps(next).Select(s => s.CutId).Order(StringComparer.Ordinal)),
            "re-plan left out: " + string.Join("; ", next.Unscheduled.Where(u => expected.Contains(u.CutId)).Select(u => $"{u.CutId} {u.Status} {u.Reason} {u.Detail}")));
        Assert.True(next.Statistics.EdgesReused > 0, "moves planned for the first schedule are reused");
        Assert.All(next.Stops, s => Assert.NotEqual("none", s.ReturnMethod));
    }

    [Fact]
    public void A_cut_beyond_a_thinning_cut_is_moot_or_made_first()
    {
        // Two cuts on one lateral: a thinning cut near the leader and a heading cut further out.
        var scan = DemoOrchard.Generate().Trees[0].Scan;
        var thinning = scan.Cuts.First(c => c.Kind == CutKind.Thinning);
        var heading = new Cut("beyond", thinning.BranchId, Math.Min(0.95, thinning.PositionAlong + 0.3), CutKind.Heading, thinning.DiameterMm * 0.9);
        var withBoth = scan with { Cuts = [thinning, heading] };
        var topology = new BranchTopology(withBoth);
        Assert.True(MootRule.Removes(withBoth, topology, 0, 1));
        Assert.False(MootRule.Removes(withBoth, topology, 1, 0));
        var moot = MootRule.Find(withBoth, topology, [0, 1]);
        Assert.Equal(0, Assert.Single(moot).Value);
    }

    private static List<ScheduleStep> Steps(Schedule schedule) => schedule.AllSteps().ToList();

    private static void AssertClose(IReadOnlyList<double> expected, IReadOnlyList<double> actual)
    {
        Assert.Equal(expected.Count, actual.Count);
        for (var j = 0; j < expected.Count; j++)
        {
            Assert.Equal(expected[j], actual[j], 9);
        }
    }
}
