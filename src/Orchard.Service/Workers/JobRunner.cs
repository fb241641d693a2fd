using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Service.Application;
using Orchard.Store;

namespace Orchard.Service.Workers;

/// <summary>
/// The plan job: turns a claimed job into its result. Plans the job's scan, or re-plans the version the job
/// names from the plan state of (tree, scan), with the cuts already done or left for a person taken from the
/// outcomes of that scan only (never of an earlier scan of the tree) and from the schedule it re-plans. The
/// schedule names its scan and, for a re-plan, the version it re-plans; its own version is the store's to
/// assign when it is written.
/// </summary>
public static class JobRunner
{
    /// <param name="deadline">Planning time before the planner stops and returns what it has, marked partial; null for none.</param>
    public static async Task<ScheduleWrite> RunAsync(JobRecord job, IOrchardStore store, TimeProvider clock, TimeSpan? deadline, CancellationToken cancellationToken, bool assumeFallingWood = true)
    {
        ArgumentNullException.ThrowIfNull(job);
        ArgumentNullException.ThrowIfNull(store);
        var scanJson = await store.GetScanAsync(job.ScanId, cancellationToken) ?? throw new InvalidOperationException($"Scan {job.ScanId} of job {job.JobId} is missing.");
        var tree = await store.GetTreeAsync(job.TreeId, cancellationToken) ?? throw new InvalidOperationException($"Tree {job.TreeId} of job {job.JobId} is missing.");
        var armJson = await store.GetArmProfileAsync(tree.ArmProfileId, cancellationToken) ?? throw new InvalidOperationException($"Arm profile {tree.ArmProfileId} is missing.");
        var scan = OrchardJson.Parse<TreeScan>(scanJson).Value ?? throw new InvalidOperationException("The stored scan does not parse.");
        var arm = OrchardJson.Parse<ArmProfile>(armJson).Value ?? throw new InvalidOperationException("The stored arm profile does not parse.");
        var settings = SequencingSettings.Default with { Deadline = deadline, AssumeFallingWood = assumeFallingWood, ReplanMovesAgainstCurrentScene = assumeFallingWood };

        Schedule schedule;
        TreePlanState state;
        if (job.Kind == JobKind.Replan)
        {
            var payload = OrchardJson.Parse<ReplanPayload>(job.PayloadJson ?? string.Empty).Value ?? throw new InvalidOperationException("The re-plan payload does not parse.");
            var baseVersion = job.BaseVersion ?? throw new InvalidOperationException($"Re-plan job {job.JobId} names no version to re-plan.");
            var (done, dropped) = await SettledCutsAsync(store, job, baseVersion, cancellationToken);
            if (await store.GetPlanStateAsync(job.TreeId, job.ScanId, cancellationToken) is { } stateJson)
            {
                state = (OrchardJson.Parse<PlanStateDocument>(stateJson).Value ?? throw new InvalidOperationException("The plan state does not parse.")).ToState();
            }
            else
            {
                // Every written schedule keeps its plan state; should it be missing, rebuild it first.
                (_, state) = await Task.Run(() => TreeSequencer.Plan(scan, arm, settings, clock, cancellationToken), cancellationToken);
            }

            var request = new ReplanRequest(payload.CurrentConfiguration, done, dropped, payload.MissedCutId, payload.Policy, payload.ArmBase);
            (schedule, state) = await Task.Run(() => TreeSequencer.Replan(scan, arm, state, request, 0, settings, clock, cancellationToken), cancellationToken);
            schedule = schedule with { ReplansVersion = baseVersion };
        }
        else
        {
            (schedule, state) = await Task.Run(() => TreeSequencer.Plan(scan, arm, settings, clock, cancellationToken), cancellationToken);
        }

        // The version is a placeholder: the store writes the one it assigns at commit.
        schedule = schedule with { Version = 0, ScanId = job.ScanId };
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

    /// <summary>
    /// Cuts already made and cuts left for a person, for a re-plan of <paramref name="baseVersion"/>: those the
    /// schedule being re-plannned lists as done or dropped (earlier re-plans of this scan), and every outcome
    /// reported for this scan (a cut's latest report decides; a missed cut stays to be planned).
    /// </summary>
    private static async Task<(List<string> Done, List<string> Dropped)> SettledCutsAsync(IOrchardStore store, JobRecord job, int baseVersion, CancellationToken cancellationToken)
    {
        var settled = new Dictionary<string, UnscheduledStatus>(StringComparer.Ordinal);
        if (await store.GetScheduleAsync(job.TreeId, baseVersion, cancellationToken) is { } previous
            && previous.ScanId == job.ScanId
            && OrchardJson.Parse<Schedule>(previous.ScheduleJson).Value is { } replanned)
        {
            foreach (var cut in replanned.Unscheduled.Where(u => u.Status is UnscheduledStatus.Done or UnscheduledStatus.Dropped))
            {
                settled[cut.CutId] = cut.Status;
            }
        }

        foreach (var outcome in await store.ListOutcomesAsync(job.TreeId, job.ScanId, cancellationToken))
        {
            switch (outcome.Outcome)
            {
                case CutOutcome.Done:
                    settled[outcome.CutId] = UnscheduledStatus.Done;
                    break;
                case CutOutcome.Skipped:
                    settled[outcome.CutId] = UnscheduledStatus.Dropped;
                    break;
            }
        }

        return (settled.Where(s => s.Value == UnscheduledStatus.Done).Select(s => s.Key).ToList(),
                settled.Where(s => s.Value == UnscheduledStatus.Dropped).Select(s => s.Key).ToList());
    }
}
