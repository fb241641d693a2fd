using Orchard.Core.Sequencing;

namespace Orchard.Store;

/// <summary>
/// An API key: its id, role (<c>tablet</c>, <c>controller</c>, <c>manager</c>, <c>admin</c>) and the SHA-256 of
/// its secret; optionally when it expires, when it was revoked, when it was last used (to within a minute)
/// and whether the demo made it (the next demo run revokes it).
/// </summary>
public sealed record ApiKeyRecord(string KeyId, string Role, string SecretHashHex, string Label, DateTimeOffset CreatedAt)
{
    public DateTimeOffset? ExpiresAt { get; init; }

    public DateTimeOffset? RevokedAt { get; init; }

    public DateTimeOffset? LastUsedAt { get; init; }

    public bool Demo { get; init; }

    /// <summary>Not revoked and not expired at <paramref name="now"/>.</summary>
    public bool IsUsableAt(DateTimeOffset now) => RevokedAt is null && (ExpiresAt is null || now < ExpiresAt);
}

/// <summary>A scan as accepted: ids chosen by the service, the tree's identity, the arm it is planned for, the canonical scan JSON.</summary>
public sealed record ScanSubmission(string ScanId, string JobId, string TreeId, string Block, string Row, int PositionInRow, string ArmProfileId, string ScanJson, RetryPolicy RetryPolicy)
{
    /// <summary>The key that posted it: named in the audit, and its open jobs count against <see cref="MaxOpenJobs"/>.</summary>
    public string? RequestedBy { get; init; }

    /// <summary>Most open (queued or running) jobs <see cref="RequestedBy"/> may have; null for no limit.</summary>
    public int? MaxOpenJobs { get; init; }
}

/// <summary>The first answer to an idempotent POST: who asked (scope), the key, a hash of the request, and the response to replay.</summary>
public sealed record IdempotencyRecord(string Scope, string Key, string RequestHashHex, int StatusCode, string ResponseJson, string? Location);

/// <summary>
/// An idempotent POST's key. The store keeps <see cref="Answer"/>'s response in the same transaction as the
/// work, made from the id of the job the request enqueued or joined (null when none), so a replay gets
/// exactly the first answer.
/// </summary>
public sealed record IdempotencyRequest(string Scope, string Key, string RequestHashHex, Func<string?, StoredAnswer> Answer);

/// <summary>A response kept for replay.</summary>
public sealed record StoredAnswer(int StatusCode, string ResponseJson, string? Location);

public enum AcceptStatus
{
    Accepted,

    /// <summary>An earlier request with the same idempotency key won; nothing was written.</summary>
    Replayed,

    /// <summary>The requester already has its quota of open jobs; nothing was written.</summary>
    QuotaExceeded,
}

public sealed record AcceptResult(AcceptStatus Status, IdempotencyRecord? Replayed, int OpenJobs = 0)
{
    public bool Accepted => Status == AcceptStatus.Accepted;
}

/// <summary>
/// A plan job: <see cref="JobKind.Plan"/> (a new scan) or <see cref="JobKind.Replan"/> (after a missed cut:
/// <see cref="PayloadJson"/> says from where, <see cref="BaseVersion"/> which version it re-plans).
/// </summary>
public sealed record JobRecord(
    string JobId,
    string TreeId,
    JobKind Kind,
    string ScanId,
    JobStatus Status,
    int Attempt,
    string? LeaseOwner,
    DateTimeOffset? LeaseUntil,
    string? PayloadJson,
    string? Error,
    int? ScheduleVersion,
    DateTimeOffset CreatedAt,
    DateTimeOffset? FinishedAt,
    int? BaseVersion,
    string? RequestedBy);

/// <summary>
/// What a finished job writes: the schedule JSON (an object; the store sets its <c>version</c> member to the
/// version it assigns at commit), the plan state JSON and figures for listings.
/// </summary>
public sealed record ScheduleWrite(string ScheduleJson, string PlanStateJson, double TotalSeconds, int StepCount, int UnscheduledCount)
{
    /// <summary>Travel moves of the schedule by planning method (for metrics; not stored).</summary>
    public IReadOnlyDictionary<string, long> MovesByMethod { get; init; } = new Dictionary<string, long>();

    /// <summary>Moves the collision-aware planner was asked for while planning (for metrics; not stored).</summary>
    public int MovePlansAttempted { get; init; }

    /// <summary>Of those, the ones no method could solve within its budget (for metrics; not stored).</summary>
    public int MovePlansFailed { get; init; }
}

public enum CompletionStatus
{
    /// <summary>The schedule is the tree's current version.</summary>
    Written,

    /// <summary>The job's scan or base version was no longer current: finished as superseded, nothing written.</summary>
    Superseded,

    /// <summary>The job is not this worker's at this attempt any more: nothing written.</summary>
    NotHeld,
}

/// <summary>What became of a job's result: written as <see cref="Version"/>, superseded (with the reason), or refused.</summary>
public sealed record CompletionResult(CompletionStatus Status, int? Version, string? Reason);

public enum LeaseRenewal
{
    Renewed,

    /// <summary>The job is not this worker's at this attempt any more.</summary>
    Lost,

    /// <summary>The job's scan or base version is no longer current; it was finished as superseded.</summary>
    Superseded,
}

public sealed record ScheduleRecord(string TreeId, int Version, string ScheduleJson, string JobId, DateTimeOffset CreatedAt, string ScanId);

/// <param name="LatestScanId">The tree's newest accepted scan.</param>
/// <param name="CurrentVersion">The newest schedule version written for the tree (of any scan).</param>
/// <param name="CurrentScanId">The scan <paramref name="CurrentVersion"/> was planned from.</param>
public sealed record TreeRecord(
    string TreeId,
    string Block,
    string Row,
    int PositionInRow,
    string ArmProfileId,
    string LatestScanId,
    RetryPolicy RetryPolicy,
    int? CurrentVersion,
    double? TotalSeconds,
    int? StepCount,
    int? UnscheduledCount,
    DateTimeOffset UpdatedAt,
    string? CurrentScanId)
{
    /// <summary>The current version was planned from the newest scan: the tree as it stands now has a schedule.</summary>
    public bool IsPlannedForLatestScan => CurrentVersion is not null && CurrentScanId == LatestScanId;
}

/// <summary>A reported cut outcome against schedule version <see cref="Version"/>.</summary>
public sealed record OutcomeSubmission(string TreeId, int Version, string CutId, CutOutcome Outcome)
{
    /// <summary>The key that reported it (audit; its open jobs count against <see cref="MaxOpenJobs"/>).</summary>
    public string? RequestedBy { get; init; }

    /// <summary>For <see cref="CutOutcome.Missed"/>: the id a new re-plan job gets.</summary>
    public string? ReplanJobId { get; init; }

    /// <summary>For <see cref="CutOutcome.Missed"/>: what the re-plan needs (where the arm is, the policy); no payload, no re-plan.</summary>
    public string? ReplanPayload { get; init; }

    /// <summary>Most open jobs <see cref="RequestedBy"/> may have when a new re-plan job is needed; null for no limit.</summary>
    public int? MaxOpenJobs { get; init; }
}

public enum OutcomeStatus
{
    Accepted,

    /// <summary>An earlier request with the same idempotency key won; nothing was written.</summary>
    Replayed,

    /// <summary>No such tree, or it has no schedule yet.</summary>
    NoSchedule,

    /// <summary>The tree was scanned again since the named version; its new plan is on the way.</summary>
    Rescanned,

    /// <summary>The named version is not the current one.</summary>
    StaleVersion,

    /// <summary>The same outcome was already recorded for this cut (for a missed cut: against this version).</summary>
    Duplicate,

    /// <summary>A different outcome was already recorded for this cut that this one contradicts.</summary>
    Contradicts,

    /// <summary>A re-plan was needed and the reporter already has its quota of open jobs; nothing was written.</summary>
    QuotaExceeded,
}

/// <summary>What became of a reported outcome; the re-plan job enqueued or joined, if any.</summary>
public sealed record OutcomeResult(OutcomeStatus Status, int? CurrentVersion, string? ReplanJobId, IdempotencyRecord? Replayed)
{
    public bool Accepted => Status == OutcomeStatus.Accepted;

    /// <summary>The tree's newest scan (for <see cref="OutcomeStatus.Rescanned"/>).</summary>
    public string? LatestScanId { get; init; }

    /// <summary>The outcome already recorded (for <see cref="OutcomeStatus.Duplicate"/> and <see cref="OutcomeStatus.Contradicts"/>).</summary>
    public OutcomeRecord? Earlier { get; init; }
}

public sealed record OutcomeRecord(string TreeId, int Version, string CutId, CutOutcome Outcome, DateTimeOffset ReportedAt, string ScanId);

public sealed record QueueFigures(long Queued, long Running, double OldestQueuedSeconds);
