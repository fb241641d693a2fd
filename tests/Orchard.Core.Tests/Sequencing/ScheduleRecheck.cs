using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Timing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// Dense re-checks of a schedule's trajectories, each against the scene it was planned for: the motion the
/// knots define (<see cref="KnotContract"/>), sampled so that no arm point moves more than 2 mm between samples
/// (joint velocities change linearly between knots, so their largest magnitude on an interval is at one of its
/// ends, and the arm model's motion bound turns them into a bound on arm-point speed), every sample checked.
/// </summary>
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

        return Dense(knots, cell.CreateChecker(), _ => -1);
    }

    /// <summary>The knots' motion sampled densely; <paramref name="groupAt"/> gives the limb the tool may touch at a time.</summary>
    public static (int Bad, int Samples) Dense(IReadOnlyList<TrajectoryPoint> knots, CollisionChecker checker, Func<double, int> groupAt)
    {
        var n = checker.Arm.JointCount;
        var (q, v, a) = (new double[n], new double[n], new double[n]);
        var speed = new double[n];
        int bad = 0, samples = 0;
        void Check(double t)
        {
            KnotContract.Sample(knots, t, q, v, a);
            samples++;
            if (!checker.IsFree(q, groupAt(t)))
            {
                bad++;
            }
        }

        Check(knots[0].TimeS);
        for (var k = 0; k + 1 < knots.Count; k++)
        {
            var h = knots[k + 1].TimeS - knots[k].TimeS;
            for (var j = 0; j < n; j++)
            {
                speed[j] = Math.Max(Math.Abs(knots[k].Velocities[j]), Math.Abs(knots[k + 1].Velocities[j]));
            }

            var bound = Enumerable.Range(0, checker.Arm.ToolLink + 1).Max(link => checker.Arm.MotionBoundM(speed, link));
            var count = Math.Max(1, (int)Math.Ceiling(bound * h / DensePathCheck.MaxPointStepM));
            for (var i = 1; i <= count; i++)
            {
                // The interval's last sample is its end knot itself: t_k + h·count/count can fall an ulp short of
                // t_{k+1}, and the parabola evaluated there lands a rounding error off the knot (past a joint
                // limit when the knot sits on one, as stow's lift at 0 m does). TrajectoryCheck takes the knot too.
                Check(i == count ? knots[k + 1].TimeS : knots[k].TimeS + (h * i / count));
            }
        }

        return (bad, samples);
    }

    /// <summary>Clear pose to pre-cut against everything; from the step's pre-cut second on, the tool allowed on the cut's limb.</summary>
    public (int Bad, int Samples) Approach(ScheduleStop stop, ScheduleStep step)
    {
        var cell = _cell.AtStand(stop.ArmBase);
        var cut = scan.Cuts.Single(c => c.Id == step.CutId);
        var limb = cell.Scene.LimbOfBranch[_topology.BranchIndex[cut.BranchId]];
        return Dense(step.Approach, cell.CreateChecker(), t => t >= step.PreCutSecond ? limb : -1);
    }

    /// <summary>A re-plan's retreat out of the reported configuration: the tool may touch the limb it was in contact with.</summary>
    public (int Bad, int Samples) Retreat(ScheduleStop stop, int toolIgnoreGroup) =>
        Dense(stop.Retreat, _cell.AtStand(stop.ArmBase).CreateChecker(), _ => toolIgnoreGroup);

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
