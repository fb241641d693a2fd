using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Xunit.Abstractions;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// A missed cut reported with the arm wherever it stopped: at the cut (the shear on the branch), at the
/// pre-cut pose, or part way through the travel to it. Every re-plan starts where the arm is, backs out
/// along the shear's axis first when it is in contact or close to the wood (a checked retreat), makes the
/// cuts still to do and ends every stop at stow; every trajectory passes the dense re-check.
/// </summary>
[Collection(DemoOrchardSchedules.Collection)]
public sealed class ReplanFromAnywhereTests(DemoOrchardSchedules orchard, ITestOutputHelper output)
{
    public enum Where
    {
        AtTheCut,
        AtThePreCutPose,
        MidMove,
    }

    [Theory]
    [InlineData(Where.AtTheCut)]
    [InlineData(Where.AtThePreCutPose)]
    [InlineData(Where.MidMove)]
    public void A_replan_starts_with_a_checked_retreat_and_ends_at_stow(Where where)
    {
        var trees = orchard.Trees.Where(t => t.Seed == DemoOrchardSchedules.Seeds[0] && t.Schedule.StepCount >= 4).Take(6).ToArray();
        Assert.NotEmpty(trees);
        var retreats = 0;
        var tried = 0;
        foreach (var tree in trees)
        {
            var steps = tree.Schedule.AllSteps().ToArray();
            var missed = steps[2];
            var stop = tree.Schedule.Stops.Single(s => s.Steps.Contains(missed));
            var reported = where switch
            {
                Where.AtTheCut => missed.CutConfiguration,
                Where.AtThePreCutPose => missed.PreCutConfiguration,
                _ => missed.Travel[missed.Travel.Count / 2].Positions,
            };
            if (where == Where.MidMove && missed.DependsOnCuts.Count > 0)
            {
                continue; // That travel runs through wood cut off before it; a re-plan checks against the whole tree.
            }

            tried++;
            var request = new ReplanRequest(reported, steps.Take(2).Select(s => s.CutId).ToArray(), [], missed.CutId, RetryPolicy.RetryLast, stop.ArmBase);
            var (next, _) = TreeSequencer.Replan(tree.Scan, orchard.Arm, tree.State, request, 2, SequencingSettings.Default, TimeProvider.System, CancellationToken.None);

            var first = next.Stops[0];
            Assert.Equal(stop.ArmBase, first.ArmBase);
            Assert.Equal(reported, first.StartConfiguration);
            Assert.Empty(next.Problems);
            Assert.Equal(ScheduleStatus.Complete, next.Status);

            // In contact, the re-plan backs out first; close to the wood, it backs out when a straight retreat adds
            // room; either way that retreat is checked.
            var cell = new WorkCell(tree.Scan, orchard.Arm).AtStand(stop.ArmBase);
            var checker = cell.CreateChecker();
            var inContact = !checker.IsFree(reported.ToArray());
            if (inContact)
            {
                Assert.True(first.Retreat.Count >= 2, $"{tree}: {where} in contact ({checker.Check(reported.ToArray()).ClearanceM * 1000:F1} mm), yet no retreat");
            }

            // At the cut or the pre-cut pose the retreat is the approach backwards, to the step's clear pose.
            if (where != Where.MidMove && !missed.ClearConfiguration.SequenceEqual(missed.PreCutConfiguration))
            {
                Assert.True(first.Retreat.Count >= 2, $"{tree}: {where}, yet no retreat to the clear pose");
                Assert.Equal(missed.ClearConfiguration, first.Retreat[^1].Positions);
            }

            if (first.Retreat.Count > 0)
            {
                Assert.Equal(reported, first.Retreat[0].Positions);
                var limb = cell.Scene.LimbOfBranch[new BranchTopology(tree.Scan).BranchIndex[tree.Scan.Cuts.Single(c => c.Id == missed.CutId).BranchId]];
                var (bad, _) = new ScheduleRecheck(tree.Scan, orchard.Arm).Retreat(first, limb);
                Assert.Equal(0, bad);
                var end = first.Retreat[^1].Positions.ToArray();
                Assert.True(cell.CreateChecker().IsFree(end), $"{tree}: the retreat ends clear of everything");
                var tool = (cell.Chain.ToolPose(end).Translation - cell.Chain.ToolPose(reported.ToArray()).Translation).Length;
                Assert.True(tool >= SequencingSettings.Default.Reachability.MinRetreatM - 1e-3, $"{tree}: the shear backed out only {tool * 1000:F0} mm");
                retreats++;
            }

            var moveStart = first.Retreat.Count > 0 ? first.Retreat[^1].Positions : reported;
            Assert.Equal(moveStart, first.Steps.Count > 0 ? first.Steps[0].Travel[0].Positions : first.ReturnToStow[0].Positions);

            // The missed cut is tried again at this stop, after the rest of it; nothing done is repeated; every stop ends at stow.
            Assert.Equal(missed.CutId, first.Steps[^1].CutId);
            Assert.DoesNotContain(next.AllSteps(), s => steps.Take(2).Any(d => d.CutId == s.CutId));
            Assert.All(next.Stops, s =>
            {
                Assert.NotEqual("none", s.ReturnMethod);
                Assert.Equal(orchard.Arm.StowConfiguration, s.ReturnToStow[^1].Positions);
            });
            var (samples, lines) = new ScheduleRecheck(tree.Scan, orchard.Arm).All(next);
            Assert.Empty(lines);
            Assert.True(samples > 0);
        }

        output.WriteLine($"{where}: {tried} re-plans, {retreats} began with a retreat");
        Assert.True(tried >= 4, "enough re-plans to show anything");
        Assert.Equal(tried, retreats); // Every re-plan backs out first, at least the minimum along the shear's axis.
    }

    [Fact]
    public void A_reported_configuration_outside_the_limits_or_trapped_in_the_wood_is_a_tree_problem()
    {
        var tree = orchard.Trees.First(t => t.Schedule.StepCount >= 3);
        var step = tree.Schedule.AllSteps().First();
        var stop = tree.Schedule.Stops[0];

        var outside = orchard.Arm.StowConfiguration.ToArray();
        outside[3] = orchard.Arm.Joints[3].UpperLimit + 0.2;
        var (beyond, _) = TreeSequencer.Replan(tree.Scan, orchard.Arm, tree.State, new ReplanRequest(outside, [], [], step.CutId, RetryPolicy.RetryLast, stop.ArmBase), 2, SequencingSettings.Default, TimeProvider.System, CancellationToken.None);
        Assert.Equal(ScheduleStatus.NothingScheduled, beyond.Status);
        var problem = Assert.Single(beyond.Problems);
        Assert.Equal("startOutsideLimits", problem.Code);
        Assert.Equal(orchard.Arm.Joints[3].Name, problem.ArmLink);
        Assert.Contains(orchard.Arm.Joints[3].Name, problem.Message, StringComparison.Ordinal);

        // Sunk into the wood: the cut configuration pushed 60 mm on along the approach, through the branch.
        var cell = new WorkCell(tree.Scan, orchard.Arm).AtStand(stop.ArmBase);
        var through = Through(cell, step.CutConfiguration.ToArray(), 0.06);
        var (stuck, _) = TreeSequencer.Replan(tree.Scan, orchard.Arm, tree.State, new ReplanRequest(through, [], [], step.CutId, RetryPolicy.RetryLast, stop.ArmBase), 2, SequencingSettings.Default, TimeProvider.System, CancellationToken.None);
        if (stuck.Problems.Count > 0)
        {
            Assert.Equal("startTrapped", stuck.Problems[0].Code);
            Assert.Equal(ScheduleStatus.NothingScheduled, stuck.Status);
            Assert.NotNull(stuck.Problems[0].Touches);
            output.WriteLine(stuck.Problems[0].Message);
        }
        else
        {
            // The straight retreat got it out: then it must have been a retreat.
            Assert.True(stuck.Stops[0].Retreat.Count >= 2);
        }
    }

    /// <summary>The configuration whose tool pose is the given one's moved on along the approach (tool +z).</summary>
    private static double[] Through(WorkCell cell, double[] q, double distanceM)
    {
        var pose = cell.Chain.ToolPose(q);
        var target = new Pose3(pose.Rotation, pose.Translation + (pose.Rotation.ColumnZ * distanceM));
        var next = new double[q.Length];
        new InverseKinematics(cell.Chain).SolveFromSeed(target, q, next);
        return next;
    }
}
