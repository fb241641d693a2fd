namespace Orchard.Store;

/// <summary>
/// Everything the service keeps. One contract, two implementations: PostgreSQL (any number of API and
/// worker processes on any number of machines share it; the work queue claims with
/// <c>FOR UPDATE SKIP LOCKED</c> and leases on database time) and an embedded SQLite file (one process,
/// an in-process worker). Every write that the field depends on is one transaction: a scan and its plan
/// job land together or not at all; a job's result is written once, fenced by its attempt.
/// Documents (scans, arm profiles, schedules, plan state) are stored as JSON text produced by the caller,
/// except that the store owns schedule versions: it assigns one at commit and writes it into the document.
/// Changes made for a key are written to the audit trail in the same transaction.
/// </summary>
public interface IOrchardStore
{
    /// <summary>"postgresql" or "sqlite", for the start-up log line.</summary>
    string Kind { get; }

    /// <summary>Applies the versioned migrations that have not run yet (safe to call from every process at start).</summary>
    Task MigrateAsync(CancellationToken cancellationToken);

    /// <summary>Is the database reachable now (for /health/ready)?</summary>
    Task<bool> PingAsync(CancellationToken cancellationToken);

    /// <summary>
    /// Runs <paramref name="body"/> while no other process sharing the store runs a body under the same
    /// <paramref name="lockName"/> (a PostgreSQL advisory lock; in-process for SQLite, which serves one process).
    /// </summary>
    Task RunExclusiveAsync(string lockName, Func<CancellationToken, Task> body, CancellationToken cancellationToken);

    // Arm profiles (admin).
    Task PutArmProfileAsync(string armId, string json, string? actorKeyId, CancellationToken cancellationToken);

    Task<string?> GetArmProfileAsync(string armId, CancellationToken cancellationToken);

    Task<IReadOnlyList<string>> ListArmProfileIdsAsync(CancellationToken cancellationToken);

    // API keys (admin), review sessions, audit, the cookie-protection key ring.
    Task AddApiKeyAsync(ApiKeyRecord key, string? actorKeyId, CancellationToken cancellationToken);

    /// <summary>Keys are found by the SHA-256 of the secret (hex), revoked and expired ones too; the caller compares in fixed time and checks <see cref="ApiKeyRecord.IsUsableAt"/>.</summary>
    Task<ApiKeyRecord?> FindApiKeyAsync(string secretHashHex, CancellationToken cancellationToken);

    Task<int> CountApiKeysAsync(CancellationToken cancellationToken);

    /// <summary>Every key, oldest first, with its expiry, revocation and last use.</summary>
    Task<IReadOnlyList<ApiKeyRecord>> ListApiKeysAsync(CancellationToken cancellationToken);

    /// <summary>Revokes a key and ends its review sessions; refuses to revoke the last usable admin key.</summary>
    Task<RevokeResult> RevokeApiKeyAsync(string keyId, string? actorKeyId, CancellationToken cancellationToken);

    /// <summary>Revokes every key the demo made that is not revoked yet; how many.</summary>
    Task<int> RevokeDemoKeysAsync(string? actorKeyId, CancellationToken cancellationToken);

    /// <summary>Notes that a key was used at <paramref name="at"/> (callers write this at most about once a minute per key).</summary>
    Task TouchApiKeyAsync(string keyId, DateTimeOffset at, CancellationToken cancellationToken);

    Task CreateSessionAsync(SessionRecord session, CancellationToken cancellationToken);

    /// <summary>A session with its key (revoked or expired ones too; see <see cref="SessionLookup.IsLiveAt"/>).</summary>
    Task<SessionLookup?> GetSessionAsync(string sessionId, CancellationToken cancellationToken);

    /// <summary>Ends a session (sign-out); false when there was no live one.</summary>
    Task<bool> RevokeSessionAsync(string sessionId, CancellationToken cancellationToken);

    Task AppendAuditAsync(AuditEntry entry, CancellationToken cancellationToken);

    /// <summary>The newest <paramref name="limit"/> audit lines, newest first.</summary>
    Task<IReadOnlyList<AuditRecord>> ListAuditAsync(int limit, CancellationToken cancellationToken);

    Task<IReadOnlyList<ProtectionKeyRecord>> GetProtectionKeysAsync(CancellationToken cancellationToken);

    Task AddProtectionKeyAsync(ProtectionKeyRecord key, CancellationToken cancellationToken);

    /// <summary>
    /// Stores a scan, creates or updates its tree (the scan becomes its newest), and enqueues its plan job,
    /// all in one transaction. With <paramref name="idempotency"/>, its answer is stored in the same
    /// transaction, and an answer already stored under the same (scope, key) wins: then nothing is written
    /// and that answer is returned. A requester at its quota of open jobs gets nothing written either.
    /// </summary>
    Task<AcceptResult> AcceptScanAsync(ScanSubmission scan, IdempotencyRequest? idempotency, CancellationToken cancellationToken);

    /// <summary>An earlier answer to a POST with this idempotency key and scope, if any.</summary>
    Task<IdempotencyRecord?> GetIdempotencyAsync(string scope, string key, CancellationToken cancellationToken);

    Task<JobRecord?> GetJobAsync(string jobId, CancellationToken cancellationToken);

    /// <summary>
    /// Claims the oldest claimable job, for <paramref name="lease"/> on database time: a queued job of a tree
    /// no other job is running for (one job per tree at a time), or a running one whose lease has expired
    /// (taking it over: the attempt number goes up, so the old worker's result is refused). Queued jobs whose
    /// scan or base version is no longer current are finished as superseded instead of being claimed.
    /// </summary>
    Task<JobRecord?> ClaimJobAsync(string workerId, TimeSpan lease, CancellationToken cancellationToken);

    /// <summary>
    /// Extends a lease; <see cref="LeaseRenewal.Lost"/> when the job is no longer this worker's at this attempt,
    /// <see cref="LeaseRenewal.Superseded"/> (and the job finished so) when its scan or base version is no longer current.
    /// </summary>
    Task<LeaseRenewal> RenewLeaseAsync(string jobId, int attempt, string workerId, TimeSpan lease, CancellationToken cancellationToken);

    /// <summary>Gives a claimed job back to the queue (shutdown before it finished).</summary>
    Task<bool> ReleaseJobAsync(string jobId, int attempt, string workerId, CancellationToken cancellationToken);

    /// <summary>
    /// Writes a job's result once, in one transaction: the schedule as the tree's next version (the version
    /// written into the document), the plan state of (tree, scan), the tree's figures, the job done. When the
    /// job's scan is no longer the tree's newest, or the version it re-plans is no longer current, the job is
    /// finished as superseded and nothing else is written. Nothing at all when the job is not this worker's
    /// at this attempt any more.
    /// </summary>
    Task<CompletionResult> CompleteJobAsync(string jobId, int attempt, string workerId, ScheduleWrite result, CancellationToken cancellationToken);

    /// <summary>Marks a job failed with a reason (fenced like <see cref="CompleteJobAsync"/>).</summary>
    Task<bool> FailJobAsync(string jobId, int attempt, string workerId, string reason, CancellationToken cancellationToken);

    Task<TreeRecord?> GetTreeAsync(string treeId, CancellationToken cancellationToken);

    Task<IReadOnlyList<TreeRecord>> ListTreesAsync(CancellationToken cancellationToken);

    /// <summary>The scan a job plans (its JSON), by scan id.</summary>
    Task<string?> GetScanAsync(string scanId, CancellationToken cancellationToken);

    /// <summary>The tree's newest schedule (highest version, of whichever scan), or null.</summary>
    Task<ScheduleRecord?> GetCurrentScheduleAsync(string treeId, CancellationToken cancellationToken);

    /// <summary>One version of a tree's schedule, or null.</summary>
    Task<ScheduleRecord?> GetScheduleAsync(string treeId, int version, CancellationToken cancellationToken);

    /// <summary>The plan state of the tree's latest plan of this scan (re-plans reuse its moves), or null.</summary>
    Task<string?> GetPlanStateAsync(string treeId, string scanId, CancellationToken cancellationToken);

    /// <summary>
    /// Records a cut outcome against a schedule version in one transaction. Refused (nothing written) when
    /// the tree has no schedule, was scanned again since, the version is not current, or the cut already has
    /// an outcome this one repeats or contradicts. A <c>missed</c> cut with a payload enqueues a re-plan of
    /// the version, or joins the one already waiting for it, so parallel reports make one new version.
    /// Idempotent like <see cref="AcceptScanAsync"/>; a refused outcome stores no idempotent answer.
    /// </summary>
    Task<OutcomeResult> RecordOutcomeAsync(OutcomeSubmission outcome, IdempotencyRequest? idempotency, CancellationToken cancellationToken);

    /// <summary>Outcomes reported for a tree's scan, oldest first (outcomes of earlier scans never count).</summary>
    Task<IReadOnlyList<OutcomeRecord>> ListOutcomesAsync(string treeId, string scanId, CancellationToken cancellationToken);

    /// <summary>Queue figures for metrics: queued jobs and the age of the oldest.</summary>
    Task<QueueFigures> GetQueueFiguresAsync(CancellationToken cancellationToken);

    /// <summary>Row counts of every table, for tests that prove nothing changed.</summary>
    Task<IReadOnlyDictionary<string, long>> CountRowsAsync(CancellationToken cancellationToken);

    // The orchard's own documents (the row registry, reference rates), tree features, progress and
    // measured cut durations: what the manager's estimates read, each in one query.

    /// <summary>An orchard document by name (<c>rows</c>, <c>rates</c>), or null when none is stored.</summary>
    Task<string?> GetOrchardDocumentAsync(string name, CancellationToken cancellationToken);

    /// <summary>Stores (replaces) an orchard document, audited as the actor's in the same transaction.</summary>
    Task PutOrchardDocumentAsync(string name, string json, string? actorKeyId, CancellationToken cancellationToken);

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
