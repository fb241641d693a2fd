using System.Data;
using System.Data.Common;
using DbUp;
using Microsoft.Data.Sqlite;

namespace Orchard.Store;

/// <summary>
/// The embedded store: one SQLite file in WAL mode, written by one process. Every write is a
/// <c>BEGIN IMMEDIATE</c> transaction (and, within this process, serialised by a lock), so claims never
/// race; readers go on while a write is in progress. SQLite has no server clock: "database time" is the
/// <see cref="TimeProvider"/> given here. Times are stored as microseconds since the Unix epoch.
/// </summary>
public sealed partial class SqliteStore : IOrchardStore, IDisposable
{
    private const int SqliteConstraint = 19;

    private readonly string connectionString;
    private readonly TimeProvider clock;
    private readonly int maxClaimsPerJob;
    private readonly SemaphoreSlim writeLock = new(1, 1);
    /// <summary>Exclusive sections by (file, name), process-wide: one process serves the embedded store.</summary>
    private static readonly System.Collections.Concurrent.ConcurrentDictionary<string, SemaphoreSlim> ExclusiveLocks = new(StringComparer.Ordinal);

    /// <param name="maxClaimsPerJob">See <see cref="JobClaimLimit"/>.</param>
    public SqliteStore(string path, TimeProvider clock, int maxClaimsPerJob = JobClaimLimit.Default)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        ArgumentNullException.ThrowIfNull(clock);
        ArgumentOutOfRangeException.ThrowIfLessThan(maxClaimsPerJob, 1);
        this.clock = clock;
        this.maxClaimsPerJob = maxClaimsPerJob;
        Path = path;
        connectionString = new SqliteConnectionStringBuilder
        {
            DataSource = path,
            Mode = SqliteOpenMode.ReadWriteCreate,
            ForeignKeys = true,
            Pooling = true,
            DefaultTimeout = 30,
        }.ToString();
    }

    public string Kind => "sqlite";

    /// <summary>The database file.</summary>
    public string Path { get; }

    /// <summary>The file's journal mode (<c>wal</c> once migrated).</summary>
    public async Task<string?> JournalModeAsync(CancellationToken cancellationToken) =>
        await ScalarAsync<string>("PRAGMA journal_mode", cancellationToken).ConfigureAwait(false);

    public async Task MigrateAsync(CancellationToken cancellationToken)
    {
        await writeLock.WaitAsync(cancellationToken).ConfigureAwait(false);
        try
        {
            OwnerOnly(create: true);
            await using (var connection = await OpenAsync(cancellationToken).ConfigureAwait(false))
            {
                await using var wal = connection.CreateCommand();
                wal.CommandText = "PRAGMA journal_mode = WAL;";
                await wal.ExecuteNonQueryAsync(cancellationToken).ConfigureAwait(false);
            }

            // Foreign keys off while migrating: SQLite's documented way to rebuild a table others refer to
            // (each script checks every reference itself before it commits).
            var migrating = new SqliteConnectionStringBuilder(connectionString) { ForeignKeys = false, Pooling = false }.ToString();
            var upgrader = DeployChanges.To
                .SqliteDatabase(migrating)
                .WithScriptsEmbeddedInAssembly(typeof(SqliteStore).Assembly, name => name.Contains(".Migrations.Sqlite.", StringComparison.Ordinal))
                .JournalToSqliteTable("schema_versions")
                .WithTransactionPerScript()
                .LogToNowhere()
                .Build();
            var result = upgrader.PerformUpgrade();
            if (!result.Successful)
            {
                throw new InvalidOperationException($"SQLite migration {result.ErrorScript?.Name} failed: {result.Error?.Message}", result.Error);
            }

            OwnerOnly(create: false);
        }
        finally
        {
            writeLock.Release();
        }
    }

    /// <summary>
    /// The database and its write-ahead log and shared-memory files are readable and writable by this user
    /// only (0600): it holds key hashes, sessions and the cookie key ring. A new file is made so before SQLite
    /// opens it (SQLite gives the -wal and -shm files the database file's mode); an older file is set so.
    /// </summary>
    private void OwnerOnly(bool create)
    {
        if (OperatingSystem.IsWindows())
        {
            return;
        }

        const UnixFileMode ownerOnly = UnixFileMode.UserRead | UnixFileMode.UserWrite;
        if (create && !File.Exists(Path))
        {
            using (File.Open(Path, new FileStreamOptions { Mode = FileMode.CreateNew, Access = FileAccess.Write, UnixCreateMode = ownerOnly }))
            {
            }
        }

        foreach (var file in new[] { Path, Path + "-wal", Path + "-shm", Path + "-journal" })
        {
            if (File.Exists(file) && (File.GetUnixFileMode(file) & ~ownerOnly) != 0)
            {
                File.SetUnixFileMode(file, ownerOnly);
            }
        }
    }

    public async Task<bool> PingAsync(CancellationToken cancellationToken)
    {
        try
        {
            await using var connection = await OpenAsync(cancellationToken).ConfigureAwait(false);
            await using var command = connection.CreateCommand();
            command.CommandText = "SELECT 1";
            return Convert.ToInt64(await command.ExecuteScalarAsync(cancellationToken).ConfigureAwait(false)) == 1;
        }
        catch (SqliteException)
        {
            return false;
        }
    }

    public async Task RunExclusiveAsync(string lockName, Func<CancellationToken, Task> body, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(body);
        // One process serves the embedded store, so a process-wide lock excludes everyone.
        var exclusiveLock = ExclusiveLocks.GetOrAdd(System.IO.Path.GetFullPath(Path) + "|" + lockName, _ => new SemaphoreSlim(1, 1));
        await exclusiveLock.WaitAsync(cancellationToken).ConfigureAwait(false);
        try
        {
            await body(cancellationToken).ConfigureAwait(false);
        }
        finally
        {
            exclusiveLock.Release();
        }
    }

    public Task PutArmProfileAsync(string armId, string json, string? actorKeyId, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            var now = Now();
            await ExecuteAsync(connection, transaction, """
                INSERT INTO arm_profiles (arm_id, profile_json, updated_at) VALUES ($id, $json, $now)
                ON CONFLICT (arm_id) DO UPDATE SET profile_json = excluded.profile_json, updated_at = excluded.updated_at
                """, ct, ("$id", armId), ("$json", json), ("$now", now)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, now, new AuditEntry(actorKeyId, "armProfile.put", armId), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken);

    public async Task<string?> GetArmProfileAsync(string armId, CancellationToken cancellationToken) =>
        await ScalarAsync<string>("SELECT profile_json FROM arm_profiles WHERE arm_id = $id", cancellationToken, ("$id", armId)).ConfigureAwait(false);

    public Task<IReadOnlyList<string>> ListArmProfileIdsAsync(CancellationToken cancellationToken) =>
        QueryAsync("SELECT arm_id FROM arm_profiles ORDER BY arm_id", r => r.GetString(0), cancellationToken);

    public Task AddApiKeyAsync(ApiKeyRecord key, string? actorKeyId, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(key);
        return WriteAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO api_keys (key_id, role, secret_hash_hex, label, created_at, expires_at, demo) VALUES ($id, $role, $hash, $label, $at, $expires, $demo)
                """, ct, ("$id", key.KeyId), ("$role", key.Role), ("$hash", key.SecretHashHex), ("$label", key.Label), ("$at", ToMicros(key.CreatedAt)),
                ("$expires", key.ExpiresAt is { } e ? ToMicros(e) : null), ("$demo", key.Demo ? 1 : 0)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, Now(), new AuditEntry(actorKeyId, "key.created", key.KeyId, $"role {key.Role}, label '{key.Label}'{(key.ExpiresAt is { } x ? $", expires {x:O}" : string.Empty)}{(key.Demo ? ", demo" : string.Empty)}"), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken);
    }

    public async Task<ApiKeyRecord?> FindApiKeyAsync(string secretHashHex, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(KeySelect + " WHERE secret_hash_hex = $hash", ReadKey, cancellationToken, ("$hash", secretHashHex)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<int> CountApiKeysAsync(CancellationToken cancellationToken) =>
        (int)await ScalarAsync<long>("SELECT count(*) FROM api_keys", cancellationToken).ConfigureAwait(false);

    public Task<IReadOnlyList<ApiKeyRecord>> ListApiKeysAsync(CancellationToken cancellationToken) =>
        QueryAsync(KeySelect + " ORDER BY created_at, key_id", ReadKey, cancellationToken);

    public Task<RevokeResult> RevokeApiKeyAsync(string keyId, string? actorKeyId, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            var now = Now();
            var rows = await QueryAsync(connection, transaction, KeySelect + " WHERE key_id = $id", ReadKey, ct, ("$id", keyId)).ConfigureAwait(false);
            if (rows.Count == 0)
            {
                return RevokeResult.NotFound;
            }

            if (rows[0].RevokedAt is not null)
            {
                return RevokeResult.AlreadyRevoked;
            }

            if (rows[0].Role == "admin" && await ScalarAsync<long>(connection, transaction, """
                SELECT count(*) FROM api_keys
                WHERE role = 'admin' AND key_id <> $id AND revoked_at IS NULL AND (expires_at IS NULL OR expires_at > $now)
                """, ct, ("$id", keyId), ("$now", now)).ConfigureAwait(false) == 0)
            {
                return RevokeResult.LastAdmin;
            }

            await ExecuteAsync(connection, transaction, "UPDATE api_keys SET revoked_at = $now WHERE key_id = $id", ct, ("$now", now), ("$id", keyId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, "UPDATE review_sessions SET revoked_at = $now WHERE key_id = $id AND revoked_at IS NULL", ct, ("$now", now), ("$id", keyId)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, now, new AuditEntry(actorKeyId, "key.revoked", keyId, $"role {rows[0].Role}, label '{rows[0].Label}'"), ct).ConfigureAwait(false);
            return RevokeResult.Revoked;
        }, cancellationToken);

    public Task<int> RevokeDemoKeysAsync(string? actorKeyId, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            var now = Now();
            var ids = await QueryAsync(connection, transaction, "SELECT key_id FROM api_keys WHERE demo = 1 AND revoked_at IS NULL", r => r.GetString(0), ct).ConfigureAwait(false);
            foreach (var id in ids)
            {
                await ExecuteAsync(connection, transaction, "UPDATE api_keys SET revoked_at = $now WHERE key_id = $id", ct, ("$now", now), ("$id", id)).ConfigureAwait(false);
                await ExecuteAsync(connection, transaction, "UPDATE review_sessions SET revoked_at = $now WHERE key_id = $id AND revoked_at IS NULL", ct, ("$now", now), ("$id", id)).ConfigureAwait(false);
                await AuditAsync(connection, transaction, now, new AuditEntry(actorKeyId, "key.revoked", id, "demo key replaced by the next demo run"), ct).ConfigureAwait(false);
            }

            return ids.Count;
        }, cancellationToken);

    public Task TouchApiKeyAsync(string keyId, DateTimeOffset at, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
            await ExecuteAsync(connection, transaction, "UPDATE api_keys SET last_used_at = $at WHERE key_id = $id AND (last_used_at IS NULL OR last_used_at < $at)",
                ct, ("$at", ToMicros(at)), ("$id", keyId)).ConfigureAwait(false),
            cancellationToken);

    public Task CreateSessionAsync(SessionRecord session, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(session);
        return WriteAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO review_sessions (session_id, key_id, created_at, expires_at) VALUES ($id, $key, $at, $expires)
                """, ct, ("$id", session.SessionId), ("$key", session.KeyId), ("$at", ToMicros(session.CreatedAt)), ("$expires", ToMicros(session.ExpiresAt))).ConfigureAwait(false);
            await AuditAsync(connection, transaction, Now(), new AuditEntry(session.KeyId, "session.signedIn", "review page", $"until {session.ExpiresAt:O}"), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken);
    }

    public async Task<SessionLookup?> GetSessionAsync(string sessionId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync("""
            SELECT s.session_id, s.key_id, s.created_at, s.expires_at, s.revoked_at,
                   k.key_id, k.role, k.secret_hash_hex, k.label, k.created_at, k.expires_at, k.revoked_at, k.last_used_at, k.demo
            FROM review_sessions s JOIN api_keys k ON k.key_id = s.key_id
            WHERE s.session_id = $id
            """,
            r => new SessionLookup(
                new SessionRecord(r.GetString(0), r.GetString(1), FromMicros(r.GetInt64(2)), FromMicros(r.GetInt64(3)), r.IsDBNull(4) ? null : FromMicros(r.GetInt64(4))),
                ReadKey(r, 5)),
            cancellationToken,
            ("$id", sessionId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<bool> RevokeSessionAsync(string sessionId, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            var now = Now();
            var key = await ScalarAsync<string>(connection, transaction, "SELECT key_id FROM review_sessions WHERE session_id = $id AND revoked_at IS NULL", ct, ("$id", sessionId)).ConfigureAwait(false);
            if (key is null)
            {
                return false;
            }

            await ExecuteAsync(connection, transaction, "UPDATE review_sessions SET revoked_at = $now WHERE session_id = $id", ct, ("$now", now), ("$id", sessionId)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, now, new AuditEntry(key, "session.signedOut", "review page"), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken);

    public Task AppendAuditAsync(AuditEntry entry, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(entry);
        return WriteAsync(async (connection, transaction, ct) =>
        {
            await AuditAsync(connection, transaction, Now(), entry, ct).ConfigureAwait(false);
            return true;
        }, cancellationToken);
    }

    public Task<IReadOnlyList<AuditRecord>> ListAuditAsync(int limit, CancellationToken cancellationToken) =>
        QueryAsync(
            "SELECT audit_id, at, key_id, action, target, detail FROM audit ORDER BY audit_id DESC LIMIT $limit",
            r => new AuditRecord(r.GetInt64(0), FromMicros(r.GetInt64(1)), r.IsDBNull(2) ? null : r.GetString(2), r.GetString(3), r.GetString(4), r.IsDBNull(5) ? null : r.GetString(5)),
            cancellationToken,
            ("$limit", Math.Clamp(limit, 1, 10_000)));

    public Task<IReadOnlyList<ProtectionKeyRecord>> GetProtectionKeysAsync(CancellationToken cancellationToken) =>
        QueryAsync("SELECT name, xml FROM protection_keys ORDER BY created_at, name", r => new ProtectionKeyRecord(r.GetString(0), r.GetString(1)), cancellationToken);

    public Task AddProtectionKeyAsync(ProtectionKeyRecord key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(key);
        return WriteAsync(async (connection, transaction, ct) =>
            await ExecuteAsync(connection, transaction, """
                INSERT INTO protection_keys (name, xml, created_at) VALUES ($name, $xml, $now)
                ON CONFLICT (name) DO UPDATE SET xml = excluded.xml
                """, ct, ("$name", key.Name), ("$xml", key.Xml), ("$now", Now())).ConfigureAwait(false),
            cancellationToken);
    }

    public async Task<AcceptResult> AcceptScanAsync(ScanSubmission scan, IdempotencyRequest? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var status = AcceptStatus.Accepted;
        var open = 0;
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, now, ct) =>
        {
            if (scan.RequestedBy is { } who && scan.MaxOpenJobs is { } max)
            {
                open = await OpenJobsOfAsync(connection, transaction, who, ct).ConfigureAwait(false);
                if (open >= max)
                {
                    status = AcceptStatus.QuotaExceeded;
                    return (false, null);
                }
            }

            await ExecuteAsync(connection, transaction, """
                INSERT INTO trees (tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy, updated_at)
                VALUES ($tree, $block, $row, $pos, $arm, $scan, $retry, $now)
                ON CONFLICT (tree_id) DO UPDATE SET block = excluded.block, row_label = excluded.row_label,
                    position_in_row = excluded.position_in_row, arm_profile_id = excluded.arm_profile_id,
                    latest_scan_id = excluded.latest_scan_id, retry_policy = excluded.retry_policy, updated_at = excluded.updated_at
                """, ct, ("$tree", scan.TreeId), ("$block", scan.Block), ("$row", scan.Row), ("$pos", scan.PositionInRow),
                ("$arm", scan.ArmProfileId), ("$scan", scan.ScanId), ("$retry", StoreText.Of(scan.RetryPolicy)), ("$now", now)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO scans (scan_id, tree_id, scan_json, created_at) VALUES ($scan, $tree, $json, $now)
                """, ct, ("$scan", scan.ScanId), ("$tree", scan.TreeId), ("$json", scan.ScanJson), ("$now", now)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, created_at, requested_by)
                VALUES ($job, $tree, 'plan', $scan, 'queued', 0, $now, $who)
                """, ct, ("$job", scan.JobId), ("$tree", scan.TreeId), ("$scan", scan.ScanId), ("$now", now), ("$who", scan.RequestedBy)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, now, new AuditEntry(scan.RequestedBy, "scan.accepted", scan.TreeId, $"scan {scan.ScanId}, plan job {scan.JobId}"), ct).ConfigureAwait(false);
            return (true, scan.JobId);
        }, cancellationToken).ConfigureAwait(false);
        return replayed is not null ? new AcceptResult(AcceptStatus.Replayed, replayed) : new AcceptResult(status, null, open);
    }

    public async Task<IdempotencyRecord?> GetIdempotencyAsync(string scope, string key, CancellationToken cancellationToken)
    {
        await using var connection = await OpenAsync(cancellationToken).ConfigureAwait(false);
        return await ReadIdempotencyAsync(connection, null, scope, key, cancellationToken).ConfigureAwait(false);
    }

    public async Task<JobRecord?> GetJobAsync(string jobId, CancellationToken cancellationToken)
    {
        await using var connection = await OpenAsync(cancellationToken).ConfigureAwait(false);
        return await ReadJobAsync(connection, null, jobId, cancellationToken).ConfigureAwait(false);
    }

    public Task<JobRecord?> ClaimJobAsync(string workerId, TimeSpan lease, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            var now = Now();
            // Jobs whose last allowed claim ran out of lease are given up (JobClaimLimit), not claimed again.
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'failed', error = $reason, finished_at = $now, lease_until = NULL
                WHERE status = 'running' AND lease_until <= $now AND attempt >= $max
                """, ct, ("$reason", JobClaimLimit.Reason(maxClaimsPerJob)), ("$now", now), ("$max", maxClaimsPerJob)).ConfigureAwait(false);

            // Jobs that could only write a superseded result are finished so, unplanned.
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs
                SET status = 'superseded', finished_at = $now, lease_until = NULL,
                    error = CASE WHEN scan_id <> (SELECT t.latest_scan_id FROM trees t WHERE t.tree_id = jobs.tree_id) THEN $byScan ELSE $byVersion END
                WHERE (status = 'queued' OR (status = 'running' AND lease_until <= $now))
                  AND EXISTS (SELECT 1 FROM trees t WHERE t.tree_id = jobs.tree_id
                              AND (jobs.scan_id <> t.latest_scan_id OR (jobs.kind = 'replan' AND jobs.base_version IS NOT t.current_version)))
                """, ct, ("$now", now), ("$byScan", StoreText.SupersededByScan), ("$byVersion", StoreText.SupersededByVersion)).ConfigureAwait(false);

            // The oldest job that is queued with no other job of its tree running, or running with its lease run out.
            var jobId = await ScalarAsync<string>(connection, transaction, """
                SELECT job_id FROM jobs j
                WHERE (j.status = 'queued' AND NOT EXISTS (SELECT 1 FROM jobs r WHERE r.tree_id = j.tree_id AND r.status = 'running'))
                   OR (j.status = 'running' AND j.lease_until <= $now)
                ORDER BY j.created_at, j.job_id
                LIMIT 1
                """, ct, ("$now", now)).ConfigureAwait(false);
            if (jobId is null)
            {
                return null;
            }

            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'running', attempt = attempt + 1, lease_owner = $worker, lease_until = $until
                WHERE job_id = $job
                """, ct, ("$worker", workerId), ("$until", now + ToMicros(lease)), ("$job", jobId)).ConfigureAwait(false);
            return await ReadJobAsync(connection, transaction, jobId, ct).ConfigureAwait(false);
        }, cancellationToken);

    public Task<LeaseRenewal> RenewLeaseAsync(string jobId, int attempt, string workerId, TimeSpan lease, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            var now = Now();
            var held = await ScalarAsync<string>(connection, transaction, """
                SELECT tree_id FROM jobs WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, ct, ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false);
            if (held is null)
            {
                return LeaseRenewal.Lost;
            }

            if (await SupersededReasonAsync(connection, transaction, jobId, ct).ConfigureAwait(false) is { } reason)
            {
                await FinishSupersededAsync(connection, transaction, jobId, reason, now, ct).ConfigureAwait(false);
                return LeaseRenewal.Superseded;
            }

            await ExecuteAsync(connection, transaction, "UPDATE jobs SET lease_until = $until WHERE job_id = $job", ct, ("$until", now + ToMicros(lease)), ("$job", jobId)).ConfigureAwait(false);
            return LeaseRenewal.Renewed;
        }, cancellationToken);

    public Task<bool> ReleaseJobAsync(string jobId, int attempt, string workerId, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'queued', lease_owner = NULL, lease_until = NULL
                WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, ct, ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false) == 1,
            cancellationToken);

    public Task<CompletionResult> CompleteJobAsync(string jobId, int attempt, string workerId, ScheduleWrite result, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(result);
        return WriteAsync(async (connection, transaction, ct) =>
        {
            var jobs = await QueryAsync(connection, transaction, """
                SELECT tree_id, scan_id FROM jobs
                WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, r => (Tree: r.GetString(0), Scan: r.GetString(1)), ct, ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false);
            if (jobs.Count == 0)
            {
                return new CompletionResult(CompletionStatus.NotHeld, null, null);
            }

            var now = Now();
            var (treeId, scanId) = jobs[0];
            if (await SupersededReasonAsync(connection, transaction, jobId, ct).ConfigureAwait(false) is { } reason)
            {
                await FinishSupersededAsync(connection, transaction, jobId, reason, now, ct).ConfigureAwait(false);
                return new CompletionResult(CompletionStatus.Superseded, null, reason);
            }

            var current = await ScalarAsync<long?>(connection, transaction, "SELECT current_version FROM trees WHERE tree_id = $tree", ct, ("$tree", treeId)).ConfigureAwait(false);
            var version = (int)(current ?? 0) + 1;
            await ExecuteAsync(connection, transaction, """
                INSERT INTO schedules (tree_id, version, schedule_json, job_id, created_at, scan_id) VALUES ($tree, $version, $json, $job, $now, $scan)
                """, ct, ("$tree", treeId), ("$version", version), ("$json", ScheduleDocuments.WithVersion(result.ScheduleJson, version)), ("$job", jobId), ("$now", now),
                ("$scan", scanId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO plan_state (tree_id, scan_id, version, state_json, updated_at) VALUES ($tree, $scan, $version, $json, $now)
                ON CONFLICT (tree_id, scan_id) DO UPDATE SET version = excluded.version, state_json = excluded.state_json, updated_at = excluded.updated_at
                """, ct, ("$tree", treeId), ("$scan", scanId), ("$version", version), ("$json", result.PlanStateJson), ("$now", now)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                UPDATE trees SET current_version = $version, current_scan_id = $scan, total_seconds = $total, step_count = $steps,
                    unscheduled_count = $unscheduled, updated_at = $now
                WHERE tree_id = $tree
                """, ct, ("$version", version), ("$scan", scanId), ("$total", result.TotalSeconds), ("$steps", result.StepCount), ("$unscheduled", result.UnscheduledCount),
                ("$now", now), ("$tree", treeId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'done', schedule_version = $version, finished_at = $now, lease_until = NULL WHERE job_id = $job
                """, ct, ("$version", version), ("$now", now), ("$job", jobId)).ConfigureAwait(false);
            return new CompletionResult(CompletionStatus.Written, version, null);
        }, cancellationToken);
    }

    public Task<bool> FailJobAsync(string jobId, int attempt, string workerId, string reason, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'failed', error = $reason, finished_at = $now, lease_until = NULL
                WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, ct, ("$reason", reason), ("$now", Now()), ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false) == 1,
            cancellationToken);

    public async Task<TreeRecord?> GetTreeAsync(string treeId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(TreeSelect + " WHERE tree_id = $tree", ReadTree, cancellationToken, ("$tree", treeId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<IReadOnlyList<TreeRecord>> ListTreesAsync(CancellationToken cancellationToken) =>
        QueryAsync(TreeSelect + " ORDER BY block, row_label, position_in_row, tree_id", ReadTree, cancellationToken);

    public Task<string?> GetScanAsync(string scanId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT scan_json FROM scans WHERE scan_id = $scan", cancellationToken, ("$scan", scanId));

    public async Task<ScheduleRecord?> GetCurrentScheduleAsync(string treeId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(ScheduleSelect + " WHERE tree_id = $tree ORDER BY version DESC LIMIT 1", ReadSchedule, cancellationToken, ("$tree", treeId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<ScheduleRecord?> GetScheduleAsync(string treeId, int version, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(ScheduleSelect + " WHERE tree_id = $tree AND version = $version", ReadSchedule, cancellationToken, ("$tree", treeId), ("$version", version)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<string?> GetPlanStateAsync(string treeId, string scanId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT state_json FROM plan_state WHERE tree_id = $tree AND scan_id = $scan", cancellationToken, ("$tree", treeId), ("$scan", scanId));

    public async Task<OutcomeResult> RecordOutcomeAsync(OutcomeSubmission outcome, IdempotencyRequest? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        OutcomeResult? result = null;
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, now, ct) =>
        {
            var trees = await QueryAsync(connection, transaction, "SELECT current_version, current_scan_id, latest_scan_id FROM trees WHERE tree_id = $tree",
                r => (Version: r.IsDBNull(0) ? (int?)null : r.GetInt32(0), ScanId: r.IsDBNull(1) ? null : r.GetString(1), Latest: r.GetString(2)), ct, ("$tree", outcome.TreeId)).ConfigureAwait(false);
            IReadOnlyList<OutcomeRecord> earlier = trees.Count == 0 || trees[0].ScanId is null ? [] : await QueryAsync(connection, transaction,
                OutcomeSelect + " WHERE tree_id = $tree AND scan_id = $scan AND cut_id = $cut ORDER BY outcome_id",
                ReadOutcome, ct, ("$tree", outcome.TreeId), ("$scan", trees[0].ScanId), ("$cut", outcome.CutId)).ConfigureAwait(false);
            var verdict = OutcomeRules.Judge(outcome, trees.Count == 0 ? null : (trees[0].Version, trees[0].ScanId, trees[0].Latest), earlier);
            if (verdict is not null)
            {
                result = verdict;
                return (false, null);
            }

            var scanId = trees[0].ScanId!;
            string? replanJobId = null;
            var newJob = false;
            if (outcome.Outcome == CutOutcome.Missed && outcome.ReplanPayload is not null)
            {
                // Parallel reports of missed cuts against one version make one re-plan.
                replanJobId = await ScalarAsync<string>(connection, transaction, """
                    SELECT job_id FROM jobs
                    WHERE tree_id = $tree AND kind = 'replan' AND scan_id = $scan AND base_version = $version AND status IN ('queued', 'running')
                    ORDER BY created_at LIMIT 1
                    """, ct, ("$tree", outcome.TreeId), ("$scan", scanId), ("$version", outcome.Version)).ConfigureAwait(false);
                if (replanJobId is null)
                {
                    if (outcome.RequestedBy is { } who && outcome.MaxOpenJobs is { } max && await OpenJobsOfAsync(connection, transaction, who, ct).ConfigureAwait(false) >= max)
                    {
                        result = new OutcomeResult(OutcomeStatus.QuotaExceeded, outcome.Version, null, null);
                        return (false, null);
                    }

                    replanJobId = outcome.ReplanJobId ?? StoreTables.NewReplanJobId();
                    newJob = true;
                    await ExecuteAsync(connection, transaction, """
                        INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, payload_json, created_at, base_version, requested_by)
                        VALUES ($job, $tree, 'replan', $scan, 'queued', 0, $payload, $now, $version, $who)
                        """, ct, ("$job", replanJobId), ("$tree", outcome.TreeId), ("$scan", scanId), ("$payload", outcome.ReplanPayload), ("$now", now),
                        ("$version", outcome.Version), ("$who", outcome.RequestedBy)).ConfigureAwait(false);
                }
            }

            await ExecuteAsync(connection, transaction, """
                INSERT INTO outcomes (tree_id, version, cut_id, outcome, job_id, scan_id, reported_at)
                VALUES ($tree, $version, $cut, $outcome, $job, $scan, $now)
                """, ct, ("$tree", outcome.TreeId), ("$version", outcome.Version), ("$cut", outcome.CutId), ("$outcome", StoreText.Of(outcome.Outcome)),
                ("$job", replanJobId), ("$scan", scanId), ("$now", now)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, now, new AuditEntry(outcome.RequestedBy, "outcome.recorded", outcome.TreeId, $"cut {outcome.CutId} {StoreText.Of(outcome.Outcome)} on version {outcome.Version}"), ct).ConfigureAwait(false);
            if (newJob)
            {
                await AuditAsync(connection, transaction, now, new AuditEntry(outcome.RequestedBy, "replan.enqueued", outcome.TreeId, $"re-plan job {replanJobId} of version {outcome.Version}"), ct).ConfigureAwait(false);
            }

            result = new OutcomeResult(OutcomeStatus.Accepted, outcome.Version, replanJobId, null);
            return (true, replanJobId);
        }, cancellationToken).ConfigureAwait(false);
        return replayed is not null ? new OutcomeResult(OutcomeStatus.Replayed, null, null, replayed) : result!;
    }

    public Task<IReadOnlyList<OutcomeRecord>> ListOutcomesAsync(string treeId, string scanId, CancellationToken cancellationToken) =>
        QueryAsync(OutcomeSelect + " WHERE tree_id = $tree AND scan_id = $scan ORDER BY reported_at, outcome_id", ReadOutcome, cancellationToken, ("$tree", treeId), ("$scan", scanId));

    public async Task<QueueFigures> GetQueueFiguresAsync(CancellationToken cancellationToken)
    {
        var now = Now();
        var rows = await QueryAsync("""
            SELECT (SELECT count(*) FROM jobs WHERE status = 'queued'),
                   (SELECT count(*) FROM jobs WHERE status = 'running'),
                   (SELECT min(created_at) FROM jobs WHERE status = 'queued')
            """,
            r => new QueueFigures(r.GetInt64(0), r.GetInt64(1), r.IsDBNull(2) ? 0 : Math.Max(0, (now - r.GetInt64(2)) / 1e6)),
            cancellationToken).ConfigureAwait(false);
        return rows[0];
    }

    public async Task<IReadOnlyDictionary<string, long>> CountRowsAsync(CancellationToken cancellationToken)
    {
        await using var connection = await OpenAsync(cancellationToken).ConfigureAwait(false);
        var counts = new Dictionary<string, long>(StringComparer.Ordinal);
        foreach (var table in StoreTables.All)
        {
            // Table names come from the fixed list above, never from input.
            counts[table] = await ScalarAsync<long>(connection, null, "SELECT count(*) FROM " + table, cancellationToken).ConfigureAwait(false);
        }

        return counts;
    }

    public void Dispose()
    {
        using (var connection = new SqliteConnection(connectionString))
        {
            SqliteConnection.ClearPool(connection);
        }

        writeLock.Dispose();
    }

    private const string TreeSelect = """
        SELECT tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy,
               current_version, total_seconds, step_count, unscheduled_count, updated_at, current_scan_id
        FROM trees
        """;

    private const string KeySelect = "SELECT key_id, role, secret_hash_hex, label, created_at, expires_at, revoked_at, last_used_at, demo FROM api_keys";

    private const string ScheduleSelect = "SELECT tree_id, version, schedule_json, job_id, created_at, scan_id FROM schedules";

    private const string OutcomeSelect = "SELECT tree_id, version, cut_id, outcome, reported_at, scan_id FROM outcomes";

    private static TreeRecord ReadTree(DbDataReader r) => new(
        r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.GetString(5), StoreText.RetryPolicyOf(r.GetString(6)),
        r.IsDBNull(7) ? null : r.GetInt32(7),
        r.IsDBNull(8) ? null : r.GetDouble(8),
        r.IsDBNull(9) ? null : r.GetInt32(9),
        r.IsDBNull(10) ? null : r.GetInt32(10),
        FromMicros(r.GetInt64(11)),
        r.IsDBNull(12) ? null : r.GetString(12));

    private static ApiKeyRecord ReadKey(DbDataReader r) => ReadKey(r, 0);

    private static ApiKeyRecord ReadKey(DbDataReader r, int at) => new(r.GetString(at), r.GetString(at + 1), r.GetString(at + 2), r.GetString(at + 3), FromMicros(r.GetInt64(at + 4)))
    {
        ExpiresAt = r.IsDBNull(at + 5) ? null : FromMicros(r.GetInt64(at + 5)),
        RevokedAt = r.IsDBNull(at + 6) ? null : FromMicros(r.GetInt64(at + 6)),
        LastUsedAt = r.IsDBNull(at + 7) ? null : FromMicros(r.GetInt64(at + 7)),
        Demo = r.GetInt64(at + 8) == 1,
    };

    private static ScheduleRecord ReadSchedule(DbDataReader r) =>
        new(r.GetString(0), r.GetInt32(1), r.GetString(2), r.GetString(3), FromMicros(r.GetInt64(4)), r.GetString(5));

    private static OutcomeRecord ReadOutcome(DbDataReader r) =>
        new(r.GetString(0), r.GetInt32(1), r.GetString(2), StoreText.CutOutcomeOf(r.GetString(3)), FromMicros(r.GetInt64(4)), r.GetString(5));

    private static async Task<JobRecord?> ReadJobAsync(SqliteConnection connection, SqliteTransaction? transaction, string jobId, CancellationToken ct)
    {
        var rows = await QueryAsync(connection, transaction, """
            SELECT job_id, tree_id, kind, scan_id, status, attempt, lease_owner, lease_until, payload_json, error, schedule_version, created_at, finished_at,
                   base_version, requested_by
            FROM jobs WHERE job_id = $job
            """,
            r => new JobRecord(
                r.GetString(0), r.GetString(1), StoreText.JobKindOf(r.GetString(2)), r.GetString(3), StoreText.JobStatusOf(r.GetString(4)), r.GetInt32(5),
                r.IsDBNull(6) ? null : r.GetString(6),
                r.IsDBNull(7) ? null : FromMicros(r.GetInt64(7)),
                r.IsDBNull(8) ? null : r.GetString(8),
                r.IsDBNull(9) ? null : r.GetString(9),
                r.IsDBNull(10) ? null : r.GetInt32(10),
                FromMicros(r.GetInt64(11)),
                r.IsDBNull(12) ? null : FromMicros(r.GetInt64(12)),
                r.IsDBNull(13) ? null : r.GetInt32(13),
                r.IsDBNull(14) ? null : r.GetString(14)),
            ct,
            ("$job", jobId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    private static async Task<int> OpenJobsOfAsync(SqliteConnection connection, SqliteTransaction transaction, string requester, CancellationToken ct) =>
        (int)await ScalarAsync<long>(connection, transaction, "SELECT count(*) FROM jobs WHERE requested_by = $who AND status IN ('queued', 'running')", ct, ("$who", requester)).ConfigureAwait(false);

    /// <summary>Why a job can only write a superseded result (its scan is not the tree's newest, or it re-plans a version that is not current); null when it is current.</summary>
    private static Task<string?> SupersededReasonAsync(SqliteConnection connection, SqliteTransaction transaction, string jobId, CancellationToken ct) =>
        ScalarAsync<string>(connection, transaction, """
            SELECT CASE WHEN j.scan_id <> t.latest_scan_id THEN $byScan
                        WHEN j.kind = 'replan' AND j.base_version IS NOT t.current_version THEN $byVersion END
            FROM jobs j JOIN trees t ON t.tree_id = j.tree_id
            WHERE j.job_id = $job
            """, ct, ("$byScan", StoreText.SupersededByScan), ("$byVersion", StoreText.SupersededByVersion), ("$job", jobId));

    private static Task<int> FinishSupersededAsync(SqliteConnection connection, SqliteTransaction transaction, string jobId, string reason, long now, CancellationToken ct) =>
        ExecuteAsync(connection, transaction, "UPDATE jobs SET status = 'superseded', error = $reason, finished_at = $now, lease_until = NULL WHERE job_id = $job",
            ct, ("$reason", reason), ("$now", now), ("$job", jobId));

    private static Task<int> AuditAsync(SqliteConnection connection, SqliteTransaction transaction, long now, AuditEntry entry, CancellationToken ct) =>
        ExecuteAsync(connection, transaction, "INSERT INTO audit (at, key_id, action, target, detail) VALUES ($at, $key, $action, $target, $detail)",
            ct, ("$at", now), ("$key", entry.KeyId), ("$action", entry.Action), ("$target", entry.Target), ("$detail", entry.Detail));

    private static async Task<IdempotencyRecord?> ReadIdempotencyAsync(SqliteConnection connection, SqliteTransaction? transaction, string scope, string key, CancellationToken ct)
    {
        var rows = await QueryAsync(connection, transaction,
            "SELECT scope, key, request_hash_hex, status_code, response_json, location FROM idempotency WHERE scope = $scope AND key = $key",
            r => new IdempotencyRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.IsDBNull(5) ? null : r.GetString(5)),
            ct,
            ("$scope", scope), ("$key", key)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    /// <summary>
    /// Runs <paramref name="body"/> in one write transaction that first stores the idempotency key (if any).
    /// When a record under the same (scope, key) exists, the primary key refuses the insert: the transaction is
    /// rolled back and the stored record returned. The body returns whether to commit and the job id its answer
    /// names; on commit, the answer made from it is what a replay returns.
    /// </summary>
    private async Task<IdempotencyRecord?> WriteIdempotentAsync(
        IdempotencyRequest? idempotency,
        Func<SqliteConnection, SqliteTransaction, long, CancellationToken, Task<(bool Commit, string? JobId)>> body,
        CancellationToken cancellationToken)
    {
        await writeLock.WaitAsync(cancellationToken).ConfigureAwait(false);
        try
        {
            await using var connection = await OpenAsync(cancellationToken).ConfigureAwait(false);
            await using (var transaction = connection.BeginTransaction(IsolationLevel.Serializable, deferred: false))
            {
                var now = Now();
                var duplicate = false;
                if (idempotency is not null)
                {
                    try
                    {
                        await ExecuteAsync(connection, transaction, """
                            INSERT INTO idempotency (scope, key, request_hash_hex, status_code, response_json, location, created_at)
                            VALUES ($scope, $key, $hash, 0, '', NULL, $now)
                            """, cancellationToken, ("$scope", idempotency.Scope), ("$key", idempotency.Key), ("$hash", idempotency.RequestHashHex), ("$now", now)).ConfigureAwait(false);
                    }
                    catch (SqliteException e) when (e.SqliteErrorCode == SqliteConstraint)
                    {
                        duplicate = true;
                    }
                }

                if (!duplicate)
                {
                    var (commit, jobId) = await body(connection, transaction, now, cancellationToken).ConfigureAwait(false);
                    if (commit)
                    {
                        if (idempotency is not null)
                        {
                            var answer = idempotency.Answer(jobId);
                            await ExecuteAsync(connection, transaction, """
                                UPDATE idempotency SET status_code = $status, response_json = $response, location = $location WHERE scope = $scope AND key = $key
                                """, cancellationToken, ("$status", answer.StatusCode), ("$response", answer.ResponseJson), ("$location", answer.Location),
                                ("$scope", idempotency.Scope), ("$key", idempotency.Key)).ConfigureAwait(false);
                        }

                        await transaction.CommitAsync(cancellationToken).ConfigureAwait(false);
                    }
                    else
                    {
                        await transaction.RollbackAsync(cancellationToken).ConfigureAwait(false);
                    }

                    return null;
                }

                await transaction.RollbackAsync(cancellationToken).ConfigureAwait(false);
            }

            return await ReadIdempotencyAsync(connection, null, idempotency!.Scope, idempotency.Key, cancellationToken).ConfigureAwait(false)
                ?? throw new InvalidOperationException("The idempotency record that refused the insert is gone.");
        }
        finally
        {
            writeLock.Release();
        }
    }

    /// <summary>One write transaction (<c>BEGIN IMMEDIATE</c>), committed when the body returns.</summary>
    private async Task<T> WriteAsync<T>(Func<SqliteConnection, SqliteTransaction, CancellationToken, Task<T>> body, CancellationToken cancellationToken)
    {
        await writeLock.WaitAsync(cancellationToken).ConfigureAwait(false);
        try
        {
            await using var connection = await OpenAsync(cancellationToken).ConfigureAwait(false);
            // Serializable and not deferred: Microsoft.Data.Sqlite issues BEGIN IMMEDIATE, taking the write lock up front.
            await using var transaction = connection.BeginTransaction(IsolationLevel.Serializable, deferred: false);
            var result = await body(connection, transaction, cancellationToken).ConfigureAwait(false);
            await transaction.CommitAsync(cancellationToken).ConfigureAwait(false);
            return result;
        }
        finally
        {
            writeLock.Release();
        }
    }

    private async Task<SqliteConnection> OpenAsync(CancellationToken cancellationToken)
    {
        var connection = new SqliteConnection(connectionString);
        try
        {
            await connection.OpenAsync(cancellationToken).ConfigureAwait(false);
            await using var command = connection.CreateCommand();
            command.CommandText = "PRAGMA busy_timeout = 10000;";
            await command.ExecuteNonQueryAsync(cancellationToken).ConfigureAwait(false);
            return connection;
        }
        catch
        {
            await connection.DisposeAsync().ConfigureAwait(false);
            throw;
        }
    }

    private long Now() => ToMicros(clock.GetUtcNow());

    private static long ToMicros(DateTimeOffset at) => (at.UtcTicks - DateTimeOffset.UnixEpoch.UtcTicks) / TimeSpan.TicksPerMicrosecond;

    private static long ToMicros(TimeSpan span) => span.Ticks / TimeSpan.TicksPerMicrosecond;

    private static DateTimeOffset FromMicros(long micros) => DateTimeOffset.UnixEpoch.AddTicks(micros * TimeSpan.TicksPerMicrosecond);

    private static Task<int> ExecuteAsync(SqliteConnection connection, SqliteTransaction? transaction, string sql, CancellationToken ct, params (string Name, object? Value)[] parameters) =>
        SqlCommands.ExecuteAsync(connection, transaction, sql, ct, parameters);

    private static Task<T?> ScalarAsync<T>(SqliteConnection connection, SqliteTransaction? transaction, string sql, CancellationToken ct, params (string Name, object? Value)[] parameters) =>
        SqlCommands.ScalarAsync<T>(connection, transaction, sql, ct, parameters);

    private async Task<T?> ScalarAsync<T>(string sql, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var connection = await OpenAsync(ct).ConfigureAwait(false);
        return await SqlCommands.ScalarAsync<T>(connection, null, sql, ct, parameters).ConfigureAwait(false);
    }

    private static Task<IReadOnlyList<T>> QueryAsync<T>(SqliteConnection connection, SqliteTransaction? transaction, string sql, Func<DbDataReader, T> map, CancellationToken ct, params (string Name, object? Value)[] parameters) =>
        SqlCommands.QueryAsync(connection, transaction, sql, map, ct, parameters);

    private async Task<IReadOnlyList<T>> QueryAsync<T>(string sql, Func<DbDataReader, T> map, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var connection = await OpenAsync(ct).ConfigureAwait(false);
        return await SqlCommands.QueryAsync(connection, null, sql, map, ct, parameters).ConfigureAwait(false);
    }
}
