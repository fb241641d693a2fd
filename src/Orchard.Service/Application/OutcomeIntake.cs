using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// A controller's cut outcome, in: read and check it against the tree's newest schedule, record it in one
/// transaction that also enqueues (or joins) the re-plan of a missed cut, idempotently and within the
/// key's queue quota, and wake the workers. Outcomes count only against schedules of the tree's newest
/// scan; a stale version, a re-scanned tree and a repeated or contradicting outcome are refused with 409.
/// </summary>
public sealed class OutcomeIntake(IOrchardStore store, JobSignal signal, IntakePolicy policy)
{
    public async Task<IntakeAnswer> RecordAsync(string treeId, ReadOnlyMemory<byte> body, Caller caller, IdempotencyContext? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(caller);
        var (report, unreadable) = DocumentReader.Read<OutcomeReport>(body);
        if (report is null)
        {
            return new IntakeAnswer.Refused(400, "The outcome is not readable", unreadable);
        }

        var tree = await store.GetTreeAsync(treeId, cancellationToken);
        if (tree is null)
        {
            return IntakeAnswer.Refused.One(404, "No such tree", "$path.treeId", "tree.unknown", $"No tree '{treeId}'.");
        }

        var current = await store.GetCurrentScheduleAsync(treeId, cancellationToken);
        var errors = OutcomeValidator.Validate(report, current);
        if (errors.Count > 0)
        {
            return new IntakeAnswer.Refused(422, "The outcome is not valid", errors);
        }

        if (report.Outcome == CutOutcome.Missed && current is not null && report.Version == current.Version)
        {
            var where = await ReportedConfiguration.CheckAsync(store, tree, current, report.CutId!, report.Configuration!, cancellationToken);
            if (where.Count > 0)
            {
                return new IntakeAnswer.Refused(422, "The arm cannot be re-planned from where it says it is", where);
            }
        }

        var (version, cutId, outcome) = (report.Version!.Value, report.CutId!, report.Outcome!.Value);
        var submission = new OutcomeSubmission(treeId, version, cutId, outcome)
        {
            RequestedBy = caller.KeyId,
            ReplanJobId = "job-" + Guid.CreateVersion7().ToString("N"),
            ReplanPayload = outcome == CutOutcome.Missed ? OrchardJson.Serialize(new ReplanPayload(report.Configuration!, cutId, tree.RetryPolicy, StopOf(current, cutId))) : null,
            MaxOpenJobs = policy.MaxOpenJobsPerKey,
        };
        var result = await store.RecordOutcomeAsync(submission, idempotency?.ToRequest(job => new StoredAnswer(202, OrchardJson.Serialize(Accepted(job)), Location(job))), cancellationToken);
        switch (result.Status)
        {
            case OutcomeStatus.Accepted:
                if (result.ReplanJobId is not null)
                {
                    signal.Notify();
                }

                await CutDurations.RecordAsync(store, tree, report, cancellationToken);

                return new IntakeAnswer.Accepted(202, Accepted(result.ReplanJobId), Location(result.ReplanJobId));
            case OutcomeStatus.Replayed:
                return new IntakeAnswer.Replayed(result.Replayed!, idempotency!.RequestHashHex);
            case OutcomeStatus.QuotaExceeded:
                return ScanIntake.QuotaExceeded(policy.MaxOpenJobsPerKey, policy);
            default:
                return Conflict(result, version, cutId, outcome);
        }

        OutcomeAccepted Accepted(string? job) => new(treeId, version, cutId, outcome, job);
    }

    /// <summary>The base pose of the stop whose steps include the cut (where the platform stands when it was missed).</summary>
    private static Core.Model.ArmBasePose? StopOf(ScheduleRecord? current, string cutId) =>
        current is null ? null : OrchardJson.Parse<Core.Model.Schedule>(current.ScheduleJson).Value?.Stops.FirstOrDefault(s => s.Steps.Any(x => x.CutId == cutId))?.ArmBase;

    private static string? Location(string? jobId) => jobId is null ? null : $"/api/v1/jobs/{jobId}";

    private static IntakeAnswer.Refused Conflict(OutcomeResult result, int version, string cutId, CutOutcome outcome)
    {
        var (title, path, code, message) = result.Status switch
        {
            OutcomeStatus.NoSchedule => ("Not planned yet", "$.version", "version.none", "The tree has no schedule yet; watch its plan job."),
            OutcomeStatus.Rescanned => ("Tree scanned again", "$.version", "version.rescanned",
                $"Version {version} was planned from a scan the tree has replaced ({result.LatestScanId} is the newest); its new schedule is on the way. Outcomes count only against schedules of the newest scan."),
            OutcomeStatus.StaleVersion => ("Stale schedule version", "$.version", "version.stale", $"The outcome refers to version {version}; the current version is {result.CurrentVersion}."),
            OutcomeStatus.Duplicate => ("Outcome already recorded", "$.outcome", "outcome.duplicate",
                $"Cut '{cutId}' was already reported {Word(result.Earlier!.Outcome)} against version {result.Earlier.Version}."),
            _ => ("Outcome contradicts an earlier one", "$.outcome", "outcome.contradicts",
                $"Cut '{cutId}' was already reported {Word(result.Earlier!.Outcome)} against version {result.Earlier.Version}; it cannot also be {Word(outcome)}."),
        };
        return new IntakeAnswer.Refused(409, title, [ValidationProblem.Error(path, code, message)])
        {
            Extensions = new Dictionary<string, object?> { ["currentVersion"] = result.CurrentVersion, ["latestScanId"] = result.LatestScanId },
        };
    }

    private static string Word(CutOutcome outcome) => outcome switch
    {
        CutOutcome.Done => "done",
        CutOutcome.Missed => "missed",
        _ => "skipped",
    };
}
