namespace Orchard.Service.Api;

/// <summary>Answer to an accepted scan: where to watch its plan.</summary>
public sealed record ScanAccepted(string JobId, string TreeId, string ScanId, string Status, IReadOnlyList<object> Warnings);

/// <summary>A plan job's state.</summary>
public sealed record JobStatus(string JobId, string TreeId, string Kind, string Status, int Attempt, int? ScheduleVersion, string? Error, DateTimeOffset CreatedAt, DateTimeOffset? FinishedAt);

/// <summary>A cut outcome as the arm controller reports it.</summary>
/// <param name="Configuration">The arm's joint values now (needed for <c>missed</c>, to re-plan from here).</param>
/// <param name="DurationSeconds">Optional, for <c>done</c>: the seconds the shear took to close through the wood and open again, as measured; it teaches the block's cut-time model.</param>
public sealed record OutcomeReport(int Version, string CutId, string Outcome, IReadOnlyList<double>? Configuration, double? DurationSeconds = null);

/// <summary>Answer to an outcome: accepted, and the re-plan job when one was started.</summary>
public sealed record OutcomeAccepted(string TreeId, int Version, string CutId, string Outcome, string? ReplanJobId);

/// <summary>A tree's latest plan in a listing.</summary>
public sealed record TreeSummary(string TreeId, string Block, string Row, int PositionInRow, int? ScheduleVersion, double? TotalSeconds, int? ScheduledCuts, int? UnscheduledCuts, string ArmProfileId);

/// <summary>A new API key: the secret is shown once and never again.</summary>
public sealed record ApiKeyCreated(string KeyId, string Role, string Label, string Secret);

/// <summary>Asks for a new API key.</summary>
public sealed record ApiKeyRequest(string Role, string? Label);
