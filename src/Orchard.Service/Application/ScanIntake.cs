using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// A tablet's scan, in: read the body strictly, check the options, validate against the arm it will be
/// planned for, store the canonical scan with its plan job in one transaction (idempotently, within the
/// key's queue quota), wake the workers.
/// </summary>
public sealed class ScanIntake(IOrchardStore store, JobSignal signal, IntakePolicy policy)
{
    public async Task<IntakeAnswer> AcceptAsync(ReadOnlyMemory<byte> body, string? armProfileId, string? retryPolicy, Caller caller, IdempotencyContext? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(caller);
        var (scan, unreadable) = DocumentReader.Read<TreeScan>(body);
        if (scan is null)
        {
            return new IntakeAnswer.Refused(400, "The scan is not readable", unreadable);
        }

        if (ParsePolicy(retryPolicy) is not { } retry)
        {
            return IntakeAnswer.Refused.One(422, "Unknown retry policy", "$query.retryPolicy", "retryPolicy.unknown", "retryPolicy must be retryNow, retryLast or drop.");
        }

        var armId = armProfileId ?? DemoArm.Id;
        if (!IdPattern.IsValid(armId))
        {
            return IntakeAnswer.Refused.One(422, "Not an id", "$query.armProfileId", "id.pattern", IdPattern.Message);
        }

        var armJson = await store.GetArmProfileAsync(armId, cancellationToken);
        if (armJson is null)
        {
            return IntakeAnswer.Refused.One(422, "Unknown arm profile", "$query.armProfileId", "armProfile.unknown", $"No arm profile '{armId}' is registered.");
        }

        var arm = OrchardJson.Parse<ArmProfile>(armJson).Value!;
        var report = TreeScanValidator.Validate(scan, shearRatingMm: arm.Tool.MaxCutDiameterMm);
        if (!report.IsValid)
        {
            return new IntakeAnswer.Refused(422, "The scan is not valid", report.Problems);
        }

        var scanId = "scan-" + Guid.CreateVersion7().ToString("N");
        var jobId = "job-" + Guid.CreateVersion7().ToString("N");
        var accepted = new ScanAccepted(jobId, scan.TreeId, scanId, JobStatus.Queued, report.Warnings.Select(w => new FieldProblem(w.Path, w.Code, w.Message)).ToArray());
        var location = $"/api/v1/jobs/{jobId}";
        var submission = new ScanSubmission(scanId, jobId, scan.TreeId, scan.Block, scan.Row, scan.PositionInRow, armId, OrchardJson.Serialize(scan), retry)
        {
            RequestedBy = caller.KeyId,
            MaxOpenJobs = policy.MaxOpenJobsPerKey,
        };
        var result = await store.AcceptScanAsync(submission, idempotency?.ToRequest(_ => new StoredAnswer(202, OrchardJson.Serialize(accepted), location)), cancellationToken);
        switch (result.Status)
        {
            case AcceptStatus.Replayed:
                return new IntakeAnswer.Replayed(result.Replayed!, idempotency!.RequestHashHex);
            case AcceptStatus.QuotaExceeded:
                return QuotaExceeded(result.OpenJobs, policy);
            default:
                await TreeFeatureIndex.RecordScanAsync(store, scan.TreeId, scanId, scan, cancellationToken);
                signal.Notify();
                return new IntakeAnswer.Accepted(202, accepted, location);
        }
    }

    /// <summary>The 429 for a key whose open jobs reached its quota.</summary>
    internal static IntakeAnswer QuotaExceeded(int openJobs, IntakePolicy policy) =>
        new IntakeAnswer.Refused(429, "Queue quota reached", [ValidationProblem.Error("$header.X-Api-Key", "quota.openJobs",
            $"This key has {openJobs} plan jobs queued or running, its quota is {policy.MaxOpenJobsPerKey}; post again when some have finished.")])
        {
            RetryAfterSeconds = policy.QuotaRetryAfterSeconds,
        };

    private static RetryPolicy? ParsePolicy(string? text) => text switch
    {
        null or "retryLast" => RetryPolicy.RetryLast,
        "retryNow" => RetryPolicy.RetryNow,
        "drop" => RetryPolicy.Drop,
        _ => null,
    };
}
