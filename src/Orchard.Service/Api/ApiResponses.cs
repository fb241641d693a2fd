using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>A plan job's state; <see cref="ReplansVersion"/> is the version a re-plan re-plans.</summary>
public sealed record JobView(string JobId, string TreeId, JobKind Kind, JobStatus Status, string ScanId, int? ReplansVersion, int Attempt, int? ScheduleVersion, string? Error, DateTimeOffset CreatedAt, DateTimeOffset? FinishedAt);

/// <summary>
/// A tree in the manager's listing: its newest scan, and its newest schedule with the scan that was
/// planned from (when they differ, the tree was scanned again and its new plan is on the way).
/// </summary>
public sealed record TreeSummary(string TreeId, string Block, string Row, int PositionInRow, string ScanId, int? ScheduleVersion, string? ScheduleScanId, bool Planned, double? TotalSeconds, int? ScheduledCuts, int? UnscheduledCuts, string ArmProfileId);
