using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Service.Api;
using Orchard.Store;

namespace Orchard.Service.Workers;

/// <summary>Turns a claimed job into its result: plans the scan, or re-plans from the stored state after a missed cut.</summary>
public static class JobRunner
{
    public static async Task<ScheduleWrite> RunAsync(JobRecord job, IOrchardStore store, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(job);
        ArgumentNullException.ThrowIfNull(store);
        var scanJson = await store.GetScanAsync(job.ScanId, cancellationToken) ?? throw new InvalidOperationException($"Scan {job.ScanId} of job {job.JobId} is missing.");
        var tree = await store.GetTreeAsync(job.TreeId, cancellationToken) ?? throw new InvalidOperationException($"Tree {job.TreeId} of job {job.JobId} is missing.");
        var armJson = await store.GetArmProfileAsync(tree.ArmProfileId, cancellationToken) ?? throw new InvalidOperationException($"Arm profile {tree.ArmProfileId} is missing.");
        var scan = OrchardJson.Parse<TreeScan>(scanJson).Value ?? throw new InvalidOperationException("The stored scan does not parse.");
        var arm = OrchardJson.Parse<ArmProfile>(armJson).Value ?? throw new InvalidOperationException("The stored arm profile does not parse.");
        var version = (tree.CurrentVersion ?? 0) + 1;
        var settings = SequencingSettings.Default;

        Schedule schedule;
        TreePlanState state;
        if (job.Kind == "replan" && job.PayloadJson is not null && await store.GetPlanStateAsync(job.TreeId, cancellationToken) is { } stateJson)
        {
            var payload = OrchardJson.Parse<ReplanPayload>(job.PayloadJson).Value ?? throw new InvalidOperationException("The re-plan payload does not parse.");
            state = (OrchardJson.Parse<PlanStateDocument>(stateJson).Value ?? throw new InvalidOperationException("The plan state does not parse.")).ToState();
            var policy = payload.Policy switch { "retryNow" => RetryPolicy.RetryNow, "drop" => RetryPolicy.Drop, _ => RetryPolicy.RetryLast };
            var request = new ReplanRequest(payload.CurrentConfiguration, payload.DoneCutIds, payload.DroppedCutIds, payload.MissedCutId, policy, payload.ArmBase);
            (schedule, state) = await Task.Run(() => TreeSequencer.Replan(scan, arm, state, request, version, settings, clock, cancellationToken), cancellationToken);
        }
        else
        {
            (schedule, state) = await Task.Run(() => TreeSequencer.Plan(scan, arm, settings, clock, cancellationToken), cancellationToken);
            schedule = schedule with { Version = version };
        }

        return new ScheduleWrite(
            OrchardJson.Serialize(schedule),
            OrchardJson.Serialize(PlanStateDocument.From(state)),
            schedule.TotalSeconds,
            schedule.StepCount,
            schedule.Unscheduled.Count)
        {
            MovesByMethod = schedule.AllSteps().GroupBy(s => s.TravelMethod).ToDictionary(g => g.Key, g => (long)g.Count()),
            MovePlansAttempted = schedule.Statistics.EdgesPlanned,
            MovePlansFailed = schedule.Statistics.EdgesFailed,
        };
    }
}
