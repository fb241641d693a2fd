namespace Orchard.Store;

/// <summary>
/// Everything the service keeps. One contract, two implementations: PostgreSQL (any number of API and
/// worker processes on any number of machines share it; the work queue claims with
/// <c>FOR UPDATE SKIP LOCKED</c> and leases on database time) and an embedded SQLite file (one process,
/// an in-process worker). Every write that the field depends on is one transaction: a scan and its plan
/// job land together or not at all; a job's result is written once, fenced by its attempt.
/// Documents (scans, arm profiles, schedules, plan state) are stored as JSON text produced by the caller.
/// </summary>
public interface IOrchardStore
{
    /// <summary>"postgresql" or "sqlite", for the start-up log line.</summary>
    string Kind { get; }

    /// <summary>Applies the versioned migrations that have not run yet (safe to call from every process at start).</summary>
    Task MigrateAsync(CancellationToken cancellationToken);

    /// <summary>Is the database reachable now (for /health/ready)?</summary>
    Task<bool> PingAsync(CancellationToken cancellationToken);

    // Arm profiles and API keys (admin).
    Task PutArmProfileAsync(string armId, string json, CancellationToken cancellationToken);

    Task<string?> GetArmProfileAsync(string armId, CancellationToken cancellationToken);

    Task<IReadOnlyList<string>> ListArmProfileIdsAsync(CancellationToken cancellationToken);

    Task AddApiKeyAsync(ApiKeyRecord key, CancellationToken cancellationToken);

    /// <summary>Keys are found by the SHA-256 of the secret (hex); the caller compares in fixed time.</summary>
    Task<ApiKeyRecord?> FindApiKeyAsync(string secretHashHex, CancellationToken cancellationToken);

    Task<int> CountApiKeysAsync(CancellationToken cancellationToken);

    /// <summary>
    /// Stores a scan, creates or updates its tree, and enqueues its plan job, all in one transaction;
    /// when <paramref name="idempotency"/> is given, its record is stored in the same transaction, and a
    /// record already stored under the same (scope, key) wins: then nothing is written and that record
    /// is returned in <see cref="AcceptResult.Replayed"/>.
    /// </summary>
    Task<AcceptResult> AcceptScanAsync(ScanSubmission scan, IdempotencyRecord? idempotency, CancellationToken cancellationToken);

    /// <summary>An earlier answer to a POST with this idempotency key and scope, if any.</summary>
    Task<IdempotencyRecord?> GetIdempotencyAsync(string scope, string key, CancellationToken cancellationToken);

    Task<JobRecord?> GetJobAsync(string jobId, CancellationToken cancellationToken);

    /// <summary>
    /// Claims the oldest queued job, or a running one whose lease has expired (taking it over: the attempt
    /// number goes up, so the old worker's result is refused), for <paramref name="lease"/> on database time.
    /// </summary>
    Task<JobRecord?> ClaimJobAsync(string workerId, TimeSpan lease, CancellationToken cancellationToken);

    /// <summary>Extends a lease; false when the job is no longer this worker's at this attempt.</summary>
    Task<bool> RenewLeaseAsync(string jobId, int attempt, string workerId, TimeSpan lease, CancellationToken cancellationToken);

    /// <summary>Gives a claimed job back to the queue (shutdown before it finished).</summary>
    Task<bool> ReleaseJobAsync(string jobId, int attempt, string workerId, CancellationToken cancellationToken);

    /// <summary>
    /// Writes a job's result once: the schedule as the tree's next version and the tree's plan state, and
    /// marks the job done, in one transaction; false (and nothing written) when the job is not this
    /// worker's at this attempt any more.
    /// </summary>
    Task<bool> CompleteJobAsync(string jobId, int attempt, string workerId, ScheduleWrite result, CancellationToken cancellationToken);

    /// <summary>Marks a job failed with a reason (fenced like <see cref="CompleteJobAsync"/>).</summary>
    Task<bool> FailJobAsync(string jobId, int attempt, string workerId, string reason, CancellationToken cancellationToken);

    Task<TreeRecord?> GetTreeAsync(string treeId, CancellationToken cancellationToken);

    Task<IReadOnlyList<TreeRecord>> ListTreesAsync(CancellationToken cancellationToken);

    /// <summary>The scan a job plans (its JSON), by scan id.</summary>
    Task<string?> GetScanAsync(string scanId, CancellationToken cancellationToken);

    /// <summary>The tree's current schedule (highest version), or null.</summary>
    Task<ScheduleRecord?> GetCurrentScheduleAsync(string treeId, CancellationToken cancellationToken);

    Task<string?> GetPlanStateAsync(string treeId, CancellationToken cancellationToken);

    /// <summary>
    /// Records a cut outcome against a schedule version in one transaction: refuses a stale version
    /// (returns the current one), stores the outcome, and for <c>missed</c> enqueues a re-plan job with
    /// <paramref name="replanPayload"/>; idempotent like <see cref="AcceptScanAsync"/>.
    /// </summary>
    Task<OutcomeResult> RecordOutcomeAsync(OutcomeSubmission outcome, string? replanPayload, IdempotencyRecord? idempotency, CancellationToken cancellationToken);

    /// <summary>Outcomes reported for a tree so far, oldest first.</summary>
    Task<IReadOnlyList<OutcomeRecord>> ListOutcomesAsync(string treeId, CancellationToken cancellationToken);

    /// <summary>Queue figures for metrics: queued jobs and the age of the oldest.</summary>
    Task<QueueFigures> GetQueueFiguresAsync(CancellationToken cancellationToken);

    /// <summary>Row counts of every table, for tests that prove nothing changed.</summary>
    Task<IReadOnlyDictionary<string, long>> CountRowsAsync(CancellationToken cancellationToken);

    // The orchard's own documents (the row registry, reference rates), tree features, progress and
    // measured cut durations: what the manager's estimates read, each in one query.

    /// <summary>An orchard document by name (<c>rows</c>, <c>rates</c>), or null when none is stored.</summary>
    Task<string?> GetOrchardDocumentAsync(string name, CancellationToken cancellationToken);

    /// <summary>Stores (replaces) an orchard document.</summary>
    Task PutOrchardDocumentAsync(string name, string json, CancellationToken cancellationToken);

    /// <summary>The features of a tree's scan; written only while <paramref name="scanId"/> is the tree's latest scan (false otherwise).</summary>
    Task<bool> PutScanFeaturesAsync(string treeId, string scanId, Core.Estimates.ScanFeatures features, CancellationToken cancellationToken);

    /// <summary>The features of a tree's schedule; written only while <paramref name="version"/> is the tree's current version (false otherwise).</summary>
    Task<bool> PutScheduleFeaturesAsync(string treeId, int version, Core.Estimates.ScheduleFeatures features, CancellationToken cancellationToken);

    /// <summary>Every tree's stored features.</summary>
    Task<IReadOnlyList<TreeFeaturesRecord>> ListTreeFeaturesAsync(CancellationToken cancellationToken);

    /// <summary>Per tree with outcomes or re-plans on its latest scan: cuts done, missed and skipped, re-plans written.</summary>
    Task<IReadOnlyList<OutcomeTally>> ListOutcomeTalliesAsync(CancellationToken cancellationToken);

    /// <summary>Stores a measured cut duration; a second report for the same (tree, version, cut) is ignored (false).</summary>
    Task<bool> AddCutDurationAsync(CutDurationRecord duration, CancellationToken cancellationToken);

    /// <summary>Every measured cut duration, oldest first.</summary>
    Task<IReadOnlyList<CutDurationRecord>> ListCutDurationsAsync(CancellationToken cancellationToken);
}
