using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// Whole demo orchards, three seeds: no tree with a cut the machine should make gets an empty schedule,
/// every stop ends at stow through a checked move, every trajectory passes an independent dense re-check
/// (no arm point moves more than 2 mm between samples; every sample within the joint limits and free), and
/// the share of eligible cuts scheduled stays high.
/// </summary>
[Collection(DemoOrchardSchedules.Collection)]
public sealed class DemoOrchardCoverageTests(DemoOrchardSchedules orchard, ITestOutputHelper output)
{
    [Fact]
    public void The_stowed_arm_is_clear_of_every_demo_tree_at_the_tablets_stand()
    {
        foreach (var tree in orchard.Trees)
        {
            var cell = new WorkCell(tree.Scan, orchard.Arm);
            var report = cell.CreateChecker().Check(orchard.Arm.StowConfiguration.ToArray());
            Assert.True(report.IsFree && report.ClearanceM >= SequencingSettings.Default.Stops.StowClearanceM,
                $"{tree}: stowed arm at {report.ClearanceM * 1000:F1} mm ({ContactDescription.Of(cell, report)})");
        }
    }

    [Fact]
    public void No_tree_with_an_eligible_cut_gets_an_empty_schedule()
    {
        foreach (var tree in orchard.Trees)
        {
            var eligible = CutEligibility.Classify(tree.Scan, orchard.Arm, new BranchTopology(tree.Scan)).Count(s => s.Kind == CutStandingKind.Eligible);
            if (eligible > 0)
            {
                Assert.True(tree.Schedule.StepCount > 0, $"{tree}: {eligible} eligible cuts, nothing scheduled; problems: {string.Join("; ", tree.Schedule.Problems.Select(p => p.Message))}");
                Assert.Equal(ScheduleStatus.Complete, tree.Schedule.Status);
            }
        }
    }

    [Fact]
    public void Every_stop_ends_at_stow_through_a_checked_move()
    {
        foreach (var tree in orchard.Trees)
        {
            Assert.NotEmpty(tree.Schedule.Stops);
            foreach (var stop in tree.Schedule.Stops)
            {
                Assert.NotEqual("none", stop.ReturnMethod);
                Assert.NotEmpty(stop.ReturnToStow);
                Assert.Equal(orchard.Arm.StowConfiguration, stop.ReturnToStow[^1].Positions);
                Assert.Equal(orchard.Arm.StowConfiguration, stop.StartConfiguration);
                Assert.NotEmpty(stop.Steps);
            }
        }
    }

    [Fact]
    public void Every_trajectory_passes_the_dense_recheck()
    {
        long samples = 0;
        var bad = new List<string>();
        foreach (var tree in orchard.Trees)
        {
            var (n, lines) = new ScheduleRecheck(tree.Scan, orchard.Arm).All(tree.Schedule);
            samples += n;
            bad.AddRange(lines.Select(l => $"seed {tree.Seed} {l}"));
        }

        output.WriteLine($"{samples:N0} samples over {orchard.Trees.Count} trees, {bad.Count} trajectories with bad samples");
        Assert.Empty(bad);
        Assert.True(samples > 100_000, "the re-check must have looked at something");
    }

    [Fact]
    public void Most_eligible_cuts_are_scheduled_on_every_seed()
    {
        foreach (var seed in DemoOrchardSchedules.Seeds)
        {
            var trees = orchard.Trees.Where(t => t.Seed == seed).ToArray();
            var eligible = 0;
            var scheduled = 0;
            foreach (var tree in trees)
            {
                var ids = CutEligibility.Classify(tree.Scan, orchard.Arm, new BranchTopology(tree.Scan))
                    .Where(s => s.Kind == CutStandingKind.Eligible).Select(s => tree.Scan.Cuts[s.CutIndex].Id).ToHashSet(StringComparer.Ordinal);
                eligible += ids.Count;
                scheduled += tree.Schedule.AllSteps().Count(s => ids.Contains(s.CutId));
            }

            output.WriteLine($"seed {seed}: {scheduled} of {eligible} eligible cuts scheduled ({(double)scheduled / eligible:P1}), {trees.Sum(t => t.Schedule.Stops.Count)} stops");
            Assert.True(scheduled >= 0.9 * eligible, $"seed {seed}: {scheduled} of {eligible}");
        }
    }

    [Fact]
    public void Every_unscheduled_cut_says_which_stop_came_nearest_and_why()
    {
        foreach (var tree in orchard.Trees)
        {
            foreach (var u in tree.Schedule.Unscheduled.Where(u => u.Status == UnscheduledStatus.Unreachable && u.Reason != UnscheduledReason.AboveShearRating))
            {
                Assert.NotNull(u.Reason);
                Assert.NotNull(u.NearestStop);
                Assert.InRange(u.NearestStop!.Value, 1, tree.Schedule.Stops.Count);
                switch (u.Reason)
                {
                    case UnscheduledReason.OutOfReach or UnscheduledReason.JointLimits:
                        Assert.True(u.ShortfallMm > 0, $"{tree} {u.CutId}: a shortfall in mm");
                        break;
                    case UnscheduledReason.Collision:
                        Assert.False(string.IsNullOrEmpty(u.BlockedBy), $"{tree} {u.CutId}: what blocked it");
                        break;
                }
            }
        }
    }
}
