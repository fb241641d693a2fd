using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Timing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>Dense re-checks of a schedule's trajectories, each against the scene it was planned for.</summary>
public sealed class ScheduleRecheck(TreeScan scan, ArmProfile arm)
{
    private readonly WorkCell _cell = new(scan, arm);
    private readonly BranchTopology _topology = new(scan);

    public (int Bad, int Samples) Move(ScheduleStop stop, IReadOnlyList<TrajectoryPoint> knots, IReadOnlyList<string> dependsOn)
    {
        var cell = _cell.AtStand(stop.ArmBase);
        if (dependsOn.Count > 0)
        {
            var branches = dependsOn.Select(id => _topology.BranchIndex[scan.Cuts.Single(c => c.Id == id).BranchId]);
            cell = cell.WithScene(Scene.WithoutBranches(scan, _topology.FallenBeyond(branches)));
        }

        return DensePathCheck.Count(knots.Select(k => k.Positions.ToArray()).ToList(), cell.CreateChecker());
    }

    /// <summary>Clear pose to pre-cut against everything; pre-cut to cut with the tool allowed on the cut's limb.</summary>
    public (int Bad, int Samples) Approach(ScheduleStop stop, ScheduleStep step)
    {
        var cell = _cell.AtStand(stop.ArmBase);
        var checker = cell.CreateChecker();
        var path = step.Approach.Select(k => k.Positions.ToArray()).ToList();
        var preCut = path.FindIndex(q => q.Zip(step.PreCutConfiguration).All(p => Math.Abs(p.First - p.Second) < 1e-12));
        Assert.True(preCut >= 0, $"{step.CutId}: the approach passes through its pre-cut configuration");
        var cut = scan.Cuts.Single(c => c.Id == step.CutId);
        var limb = cell.Scene.LimbOfBranch[_topology.BranchIndex[cut.BranchId]];
        var (b1, s1) = DensePathCheck.Count(path.Take(preCut + 1).ToList(), checker);
        var (b2, s2) = DensePathCheck.Count(path.Skip(preCut).ToList(), checker, limb);
        return (b1 + b2, s1 + s2);
    }

    /// <summary>A re-plan's retreat out of the reported configuration: the tool may touch the limb it was in contact with.</summary>
    public (int Bad, int Samples) Retreat(ScheduleStop stop, int toolIgnoreGroup) =>
        DensePathCheck.Count(stop.Retreat.Select(k => k.Positions.ToArray()).ToList(), _cell.AtStand(stop.ArmBase).CreateChecker(), toolIgnoreGroup);

    /// <summary>Every trajectory of a schedule (a re-plan's retreat aside): bad samples, samples, and a line per bad trajectory.</summary>
    public (long Samples, List<string> Bad) All(Schedule schedule)
    {
        long samples = 0;
        var bad = new List<string>();
        foreach (var stop in schedule.Stops)
        {
            foreach (var step in stop.Steps)
            {
                var (b1, s1) = Move(stop, step.Travel, step.DependsOnCuts);
                var (b2, s2) = Approach(stop, step);
                samples += s1 + s2;
                if (b1 + b2 > 0)
                {
                    bad.Add($"{scan.TreeId} stop {stop.Sequence} step {step.Sequence} ({step.CutId}): {b1} travel and {b2} approach samples not free");
                }
            }

            var (b3, s3) = Move(stop, stop.ReturnToStow, stop.ReturnDependsOnCuts);
            samples += s3;
            if (b3 > 0)
            {
                bad.Add($"{scan.TreeId} stop {stop.Sequence}: {b3} samples of the return to stow not free");
            }
        }

        return (samples, bad);
    }
}
