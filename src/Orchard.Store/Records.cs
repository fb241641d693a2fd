namespace Orchard.Store;

/// <summary>An API key: its id, role (<c>tablet</c>, <c>controller</c>, <c>manager</c>, <c>admin</c>) and the SHA-256 of its secret.</summary>
public sealed record ApiKeyRecord(string KeyId, string Role, string SecretHashHex, string Label, DateTimeOffset CreatedAt);

/// <summary>A scan as accepted: ids chosen by the service, the tree's identity, the arm it is planned for, the scan JSON.</summary>
public sealed record ScanSubmission(string ScanId, string JobId, string TreeId, string Block, string Row, int PositionInRow, string ArmProfileId, string ScanJson, string RetryPolicy);

/// <summary>The first answer to an idempotent POST: who asked (scope), the key, a hash of the body, and the response to replay.</summary>
public sealed record IdempotencyRecord(string Scope, string Key, string RequestHashHex, int StatusCode, string ResponseJson, string? Location);

public sealed record AcceptResult(bool Accepted, IdempotencyRecord? Replayed);

/// <summary>A plan job. Kind <c>plan</c> (a new scan) or <c>replan</c> (after a missed cut; <see cref="PayloadJson"/> says from where).</summary>
public sealed record JobRecord(
    string JobId,
    string TreeId,
    string Kind,
    string ScanId,
    string Status,
    int Attempt,
    string? LeaseOwner,
    DateTimeOffset? LeaseUntil,
    string? PayloadJson,
    string? Error,
    int? ScheduleVersion,
    DateTimeOffset CreatedAt,
    DateTimeOffset? FinishedAt);

/// <summary>What a finished job writes: the schedule JSON (its version is the tree's next), the plan state JSON and figures for listings.</summary>
public sealed record ScheduleWrite(string ScheduleJson, string PlanStateJson, double TotalSeconds, int StepCount, int UnscheduledCount)
{
    /// <summary>Travel moves of the schedule by planning method (for metrics; not stored).</summary>
    public IReadOnlyDictionary<string, long> MovesByMethod { get; init; } = new Dictionary<string, long>();

    /// <summary>Moves the collision-aware planner was asked for while planning (for metrics; not stored).</summary>
    public int MovePlansAttempted { get; init; }

    /// <summary>Of those, the ones no method could solve within its budget (for metrics; not stored).</summary>
    public int MovePlansFailed { get; init; }
}

public sealed record ScheduleRecord(string TreeId, int Version, string ScheduleJson, string JobId, DateTimeOffset CreatedAt);

public sealed record TreeRecord(
    string TreeId,
    string Block,
    string Row,
    int PositionInRow,
    string ArmProfileId,
    string LatestScanId,
    string RetryPolicy,
    int? CurrentVersion,
    double? TotalSeconds,
    int? StepCount,
    int? UnscheduledCount,
    DateTimeOffset UpdatedAt);

/// <summary>A reported cut outcome: <c>done</c>, <c>missed</c> or <c>skipped</c>, against schedule version <see cref="Version"/>.</summary>
public sealed record OutcomeSubmission(string TreeId, int Version, string CutId, string Outcome, string? JobId, string? ScanId);

/// <summary>Accepted, or refused as stale with the current version; a replayed idempotent answer; the re-plan job enqueued, if any.</summary>
public sealed record OutcomeResult(bool Accepted, int? CurrentVersion, string? ReplanJobId, IdempotencyRecord? Replayed);

public sealed record OutcomeRecord(string TreeId, int Version, string CutId, string Outcome, DateTimeOffset ReportedAt);

public sealed record QueueFigures(long Queued, long Running, double OldestQueuedSeconds);
