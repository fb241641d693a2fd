using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Planning;
using Orchard.Core.Randomness;
using Orchard.Core.Sequencing;
using Orchard.Core.Timing;

namespace Orchard.Service.Bench;

/// <summary>
/// The baseline a sequencer must beat: the same cuts as the schedule, made bottom-up (by the height of
/// the cut point), each with its clearest candidate, the moves planned by the same planner.
/// </summary>
internal static class NaiveSweep
{
    public sealed record Result(double TotalSeconds, double TravelSeconds, int Failed);

    public static Result Run(TreeScan scan, ArmProfile arm, TreePlanState state, Schedule schedule, SequencingSettings settings, CancellationToken cancellationToken)
    {
        var baseCell = new WorkCell(scan, arm);
        var limits = JointSpeedLimits.From(arm);
        var planner = new MovePlanner(settings.Planner);
        var index = scan.Cuts.Select((c, i) => (c.Id, i)).ToDictionary(p => p.Id, p => p.i);
        var nodes = scan.Nodes.ToDictionary(n => n.Id);
        double Height(int cut)
        {
            var branch = scan.Branches.First(b => b.Id == scan.Cuts[cut].BranchId);
            return nodes[branch.FromNode].ZM + ((nodes[branch.ToNode].ZM - nodes[branch.FromNode].ZM) * scan.Cuts[cut].PositionAlong);
        }

        var travel = 0.0;
        var total = 0.0;
        var failed = 0;
        var random = new DeterministicRandom(settings.Seed);

        // The same stops and cuts as the schedule; at each stop the cuts bottom-up, each by its first candidate.
        foreach (var stop in schedule.Stops)
        {
            var stand = state.Stands.First(s => s.Stand.Side == stop.Side && s.Stand.ArmBase == stop.ArmBase);
            var reach = stand.Reachability.ToDictionary(r => r.CutIndex);
            var checker = baseCell.AtStand(stop.ArmBase).CreateChecker();
            var order = stop.Steps.Select(s => index[s.CutId]).OrderBy(Height).ThenBy(c => c).ToList();
            var at = arm.StowConfiguration.ToArray();
            foreach (var cut in order.Append(-1))
            {
                cancellationToken.ThrowIfCancellationRequested();
                var candidate = cut >= 0 ? reach[cut].Candidates[0] : null;
                var target = candidate?.ClearConfiguration.ToArray() ?? arm.StowConfiguration.ToArray();
                var move = planner.Plan(at, target, checker, random.Fork(), TimeProvider.System, cancellationToken);
                if (!move.Success)
                {
                    failed++;
                    continue;
                }

                var seconds = TimeParameterizer.Parameterize(move.Path, limits).DurationS;
                total += seconds;
                if (candidate is not null)
                {
                    travel += seconds;
                    var (approach, _) = ApproachTiming.Time(candidate, limits, settings.ApproachSpeedMS, settings.ApproachAccelerationMS2);
                    total += (2 * approach) + arm.CutTime.SecondsFor(scan.Cuts[cut].DiameterMm);
                }

                at = target;
            }

            total += stop.PlatformMoveSeconds;
        }

        return new Result(total, travel, failed);
    }
}
