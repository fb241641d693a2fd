using System.Data.Common;
using DbUp;
using Npgsql;

namespace Orchard.Store;

/// <summary>
/// The production store. Any number of API and worker processes share one database: leases are on
/// database time (<c>now()</c>), claims lock the oldest claimable job with <c>FOR UPDATE SKIP LOCKED</c>,
/// and every result write is fenced by (job id, attempt, lease owner, status running).
/// </summary>
public sealed partial class PostgresStore : IOrchardStore, IAsyncDisposable, IDisposable
{
    /// <summary>The advisory lock key that serialises migrations across processes ("ORCHARD1").</summary>
    private const long MigrationLockKey = 0x4F52434841524431;

    private const string IdempotencyConstraint = "idempotency_scope_key";

    private readonly NpgsqlDataSource dataSource;
    private readonly string connectionString;
    private readonly int maxClaimsPerJob;

    /// <param name="maxClaimsPerJob">See <see cref="JobClaimLimit"/>.</param>
    public PostgresStore(string connectionString, int maxClaimsPerJob = JobClaimLimit.Default)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(connectionString);
        ArgumentOutOfRangeException.ThrowIfLessThan(maxClaimsPerJob, 1);
        this.connectionString = connectionString;
        this.maxClaimsPerJob = maxClaimsPerJob;
        dataSource = NpgsqlDataSource.Create(Tuned(connectionString));
    }

    public string Kind => "postgresql";

    /// <summary>
    /// Pool settings for many short queries, unless the connection string sets them itself: no session
    /// reset when a connection goes back to the pool (the store never changes session state, except the
    /// migration lock it always releases; the reset is a DISCARD ALL before the next query and drops
    /// prepared statements), and statements used twice are prepared automatically.
    /// </summary>
    internal static string Tuned(string connectionString)
    {
        var builder = new NpgsqlConnectionStringBuilder(connectionString);
        var given = connectionString.ToUpperInvariant().Replace(" ", "", StringComparison.Ordinal);
        if (!given.Contains("NORESETONCLOSE=", StringComparison.Ordinal))
        {
            builder.NoResetOnClose = true;
        }

        if (!given.Contains("MAXAUTOPREPARE=", StringComparison.Ordinal))
        {
            builder.MaxAutoPrepare = 64;
        }

        return builder.ConnectionString;
    }

    public async Task MigrateAsync(CancellationToken cancellationToken)
    {
        // A session-level advisory lock: a second process waits here until the first has migrated,
        // then finds nothing left to run.
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await ExecuteAsync(connection, null, "SELECT pg_advisory_lock(@key)", cancellationToken, ("key", MigrationLockKey)).ConfigureAwait(false);
        try
        {
            var upgrader = DeployChanges.To
                .PostgresqlDatabase(connectionString)
                .WithScriptsEmbeddedInAssembly(typeof(PostgresStore).Assembly, name => name.Contains(".Migrations.Postgres.", StringComparison.Ordinal))
                .JournalToPostgresqlTable("public", "schema_versions")
                .WithTransactionPerScript()
                .LogToNowhere()
                .Build();
            var result = await Task.Run(upgrader.PerformUpgrade, cancellationToken).ConfigureAwait(false);
            if (!result.Successful)
            {
                throw new InvalidOperationException($"PostgreSQL migration {result.ErrorScript?.Name} failed: {result.Error?.Message}", result.Error);
            }
        }
        finally
        {
            await ExecuteAsync(connection, null, "SELECT pg_advisory_unlock(@key)", CancellationToken.None, ("key", MigrationLockKey)).ConfigureAwait(false);
        }
    }

    public async Task<bool> PingAsync(CancellationToken cancellationToken)
    {
        try
        {
            return await ScalarAsync<int>("SELECT 1", cancellationToken).ConfigureAwait(false) == 1;
        }
        catch (NpgsqlException)
        {
            return false;
        }
        catch (TimeoutException)
        {
            return false;
        }
    }

    public async Task RunExclusiveAsync(string lockName, Func<CancellationToken, Task> body, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(body);
        // A session-level advisory lock on a connection of its own, held while the body runs.
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await ExecuteAsync(connection, null, "SELECT pg_advisory_lock(hashtextextended(@name, 0))", cancellationToken, ("name", "orchard:" + lockName)).ConfigureAwait(false);
        try
        {
            await body(cancellationToken).ConfigureAwait(false);
        }
        finally
        {
            await ExecuteAsync(connection, null, "SELECT pg_advisory_unlock(hashtextextended(@name, 0))", CancellationToken.None, ("name", "orchard:" + lockName)).ConfigureAwait(false);
        }
    }

    public async Task PutArmProfileAsync(string armId, string json, string? actorKeyId, CancellationToken cancellationToken)
    {
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO arm_profiles (arm_id, profile_json, updated_at) VALUES (@id, @json, now())
                ON CONFLICT (arm_id) DO UPDATE SET profile_json = excluded.profile_json, updated_at = excluded.updated_at
                """, ct, ("id", armId), ("json", json)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(actorKeyId, "armProfile.put", armId), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken).ConfigureAwait(false);
    }

    public Task<string?> GetArmProfileAsync(string armId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT profile_json FROM arm_profiles WHERE arm_id = @id", cancellationToken, ("id", armId));

    public Task<IReadOnlyList<string>> ListArmProfileIdsAsync(CancellationToken cancellationToken) =>
        QueryAsync("SELECT arm_id FROM arm_profiles ORDER BY arm_id COLLATE \"C\"", r => r.GetString(0), cancellationToken);

    public async Task AddApiKeyAsync(ApiKeyRecord key, string? actorKeyId, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(key);
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO api_keys (key_id, role, secret_hash_hex, label, created_at, expires_at, demo) VALUES (@id, @role, @hash, @label, @at, @expires, @demo)
                """, ct, ("id", key.KeyId), ("role", key.Role), ("hash", key.SecretHashHex), ("label", key.Label), ("at", key.CreatedAt.ToUniversalTime()),
                ("expires", key.ExpiresAt?.ToUniversalTime()), ("demo", key.Demo)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(actorKeyId, "key.created", key.KeyId, $"role {key.Role}, label '{key.Label}'{(key.ExpiresAt is { } e ? $", expires {e:O}" : string.Empty)}{(key.Demo ? ", demo" : string.Empty)}"), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken).ConfigureAwait(false);
    }

    public async Task<ApiKeyRecord?> FindApiKeyAsync(string secretHashHex, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(KeySelect + " WHERE secret_hash_hex = @hash", ReadKey, cancellationToken, ("hash", secretHashHex)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<int> CountApiKeysAsync(CancellationToken cancellationToken) =>
        (int)await ScalarAsync<long>("SELECT count(*) FROM api_keys", cancellationToken).ConfigureAwait(false);

    public Task<IReadOnlyList<ApiKeyRecord>> ListApiKeysAsync(CancellationToken cancellationToken) =>
        QueryAsync(KeySelect + " ORDER BY created_at, key_id COLLATE \"C\"", ReadKey, cancellationToken);

    public async Task<RevokeResult> RevokeApiKeyAsync(string keyId, string? actorKeyId, CancellationToken cancellationToken)
    {
        var result = RevokeResult.NotFound;
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            // Lock every admin key first, so two admins revoking each other cannot both succeed.
            await ExecuteAsync(connection, transaction, "SELECT key_id FROM api_keys WHERE role = 'admin' ORDER BY key_id FOR UPDATE", ct).ConfigureAwait(false);
            var rows = await QueryAsync(connection, transaction, KeySelect + " WHERE key_id = @id FOR UPDATE", ReadKey, ct, ("id", keyId)).ConfigureAwait(false);
            if (rows.Count == 0)
            {
                return false;
            }

            if (rows[0].RevokedAt is not null)
            {
                result = RevokeResult.AlreadyRevoked;
                return false;
            }

            if (rows[0].Role == "admin" && await ScalarAsync<long>(connection, transaction, """
                SELECT count(*) FROM api_keys
                WHERE role = 'admin' AND key_id <> @id AND revoked_at IS NULL AND (expires_at IS NULL OR expires_at > now())
                """, ct, ("id", keyId)).ConfigureAwait(false) == 0)
            {
                result = RevokeResult.LastAdmin;
                return false;
            }

            await ExecuteAsync(connection, transaction, "UPDATE api_keys SET revoked_at = now() WHERE key_id = @id", ct, ("id", keyId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, "UPDATE review_sessions SET revoked_at = now() WHERE key_id = @id AND revoked_at IS NULL", ct, ("id", keyId)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(actorKeyId, "key.revoked", keyId, $"role {rows[0].Role}, label '{rows[0].Label}'"), ct).ConfigureAwait(false);
            result = RevokeResult.Revoked;
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return result;
    }

    public async Task<int> RevokeDemoKeysAsync(string? actorKeyId, CancellationToken cancellationToken)
    {
        var count = 0;
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            var ids = await QueryAsync(connection, transaction, "UPDATE api_keys SET revoked_at = now() WHERE demo AND revoked_at IS NULL RETURNING key_id", r => r.GetString(0), ct).ConfigureAwait(false);
            foreach (var id in ids)
            {
                await ExecuteAsync(connection, transaction, "UPDATE review_sessions SET revoked_at = now() WHERE key_id = @id AND revoked_at IS NULL", ct, ("id", id)).ConfigureAwait(false);
                await AuditAsync(connection, transaction, new AuditEntry(actorKeyId, "key.revoked", id, "demo key replaced by the next demo run"), ct).ConfigureAwait(false);
            }

            count = ids.Count;
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return count;
    }

    public async Task TouchApiKeyAsync(string keyId, DateTimeOffset at, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await ExecuteAsync(connection, null, "UPDATE api_keys SET last_used_at = @at WHERE key_id = @id AND (last_used_at IS NULL OR last_used_at < @at)",
            cancellationToken, ("at", at.ToUniversalTime()), ("id", keyId)).ConfigureAwait(false);
    }

    public async Task CreateSessionAsync(SessionRecord session, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(session);
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO review_sessions (session_id, key_id, created_at, expires_at) VALUES (@id, @key, @at, @expires)
                """, ct, ("id", session.SessionId), ("key", session.KeyId), ("at", session.CreatedAt.ToUniversalTime()), ("expires", session.ExpiresAt.ToUniversalTime())).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(session.KeyId, "session.signedIn", "review page", $"until {session.ExpiresAt:O}"), ct).ConfigureAwait(false);
            return true;
        }, cancellationToken).ConfigureAwait(false);
    }

    public async Task<SessionLookup?> GetSessionAsync(string sessionId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync("""
            SELECT s.session_id, s.key_id, s.created_at, s.expires_at, s.revoked_at,
                   k.key_id, k.role, k.secret_hash_hex, k.label, k.created_at, k.expires_at, k.revoked_at, k.last_used_at, k.demo
            FROM review_sessions s JOIN api_keys k ON k.key_id = s.key_id
            WHERE s.session_id = @id
            """,
            r => new SessionLookup(
                new SessionRecord(r.GetString(0), r.GetString(1), r.GetFieldValue<DateTimeOffset>(2), r.GetFieldValue<DateTimeOffset>(3), r.IsDBNull(4) ? null : r.GetFieldValue<DateTimeOffset>(4)),
                ReadKey(r, 5)),
            cancellationToken,
            ("id", sessionId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<bool> RevokeSessionAsync(string sessionId, CancellationToken cancellationToken)
    {
        var revoked = false;
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            var key = await ScalarAsync<string>(connection, transaction,
                "UPDATE review_sessions SET revoked_at = now() WHERE session_id = @id AND revoked_at IS NULL RETURNING key_id", ct, ("id", sessionId)).ConfigureAwait(false);
            if (key is null)
            {
                return false;
            }

            await AuditAsync(connection, transaction, new AuditEntry(key, "session.signedOut", "review page"), ct).ConfigureAwait(false);
            revoked = true;
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return revoked;
    }

    public async Task AppendAuditAsync(AuditEntry entry, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(entry);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await AuditAsync(connection, null, entry, cancellationToken).ConfigureAwait(false);
    }

    public Task<IReadOnlyList<AuditRecord>> ListAuditAsync(int limit, CancellationToken cancellationToken) =>
        QueryAsync(
            "SELECT audit_id, at, key_id, action, target, detail FROM audit ORDER BY audit_id DESC LIMIT @limit",
            r => new AuditRecord(r.GetInt64(0), r.GetFieldValue<DateTimeOffset>(1), r.IsDBNull(2) ? null : r.GetString(2), r.GetString(3), r.GetString(4), r.IsDBNull(5) ? null : r.GetString(5)),
            cancellationToken,
            ("limit", Math.Clamp(limit, 1, 10_000)));

    public Task<IReadOnlyList<ProtectionKeyRecord>> GetProtectionKeysAsync(CancellationToken cancellationToken) =>
        QueryAsync("SELECT name, xml FROM protection_keys ORDER BY created_at, name COLLATE \"C\"", r => new ProtectionKeyRecord(r.GetString(0), r.GetString(1)), cancellationToken);

    public async Task AddProtectionKeyAsync(ProtectionKeyRecord key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(key);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await ExecuteAsync(connection, null, """
            INSERT INTO protection_keys (name, xml, created_at) VALUES (@name, @xml, now())
            ON CONFLICT (name) DO UPDATE SET xml = excluded.xml
            """, cancellationToken, ("name", key.Name), ("xml", key.Xml)).ConfigureAwait(false);
    }

    public async Task<AcceptResult> AcceptScanAsync(ScanSubmission scan, IdempotencyRequest? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var status = AcceptStatus.Accepted;
        var open = 0;
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, ct) =>
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
                VALUES (@tree, @block, @row, @pos, @arm, @scan, @retry, now())
                ON CONFLICT (tree_id) DO UPDATE SET block = excluded.block, row_label = excluded.row_label,
                    position_in_row = excluded.position_in_row, arm_profile_id = excluded.arm_profile_id,
                    latest_scan_id = excluded.latest_scan_id, retry_policy = excluded.retry_policy, updated_at = excluded.updated_at
                """, ct, ("tree", scan.TreeId), ("block", scan.Block), ("row", scan.Row), ("pos", scan.PositionInRow),
                ("arm", scan.ArmProfileId), ("scan", scan.ScanId), ("retry", StoreText.Of(scan.RetryPolicy))).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO scans (scan_id, tree_id, scan_json, created_at) VALUES (@scan, @tree, @json, now())
                """, ct, ("scan", scan.ScanId), ("tree", scan.TreeId), ("json", scan.ScanJson)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, created_at, requested_by)
                VALUES (@job, @tree, 'plan', @scan, 'queued', 0, now(), @who)
                """, ct, ("job", scan.JobId), ("tree", scan.TreeId), ("scan", scan.ScanId), ("who", scan.RequestedBy)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(scan.RequestedBy, "scan.accepted", scan.TreeId, $"scan {scan.ScanId}, plan job {scan.JobId}"), ct).ConfigureAwait(false);
            return (true, scan.JobId);
        }, cancellationToken).ConfigureAwait(false);
        return replayed is not null ? new AcceptResult(AcceptStatus.Replayed, replayed) : new AcceptResult(status, null, open);
    }

    public async Task<IdempotencyRecord?> GetIdempotencyAsync(string scope, string key, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ReadIdempotencyAsync(connection, scope, key, cancellationToken).ConfigureAwait(false);
    }

    public async Task<JobRecord?> GetJobAsync(string jobId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(JobSelect + " FROM jobs WHERE job_id = @job", ReadJob, cancellationToken, ("job", jobId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<JobRecord?> ClaimJobAsync(string workerId, TimeSpan lease, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        // Jobs whose last allowed claim ran out of lease are given up (JobClaimLimit), not claimed again.
        await ExecuteAsync(connection, null, """
            UPDATE jobs SET status = 'failed', error = @reason, finished_at = now(), lease_until = NULL
            WHERE status = 'running' AND lease_until <= now() AND attempt >= @max
            """, cancellationToken, ("reason", JobClaimLimit.Reason(maxClaimsPerJob)), ("max", maxClaimsPerJob)).ConfigureAwait(false);

        // Jobs that could only write a superseded result are finished so, unplanned.
        await ExecuteAsync(connection, null, """
            UPDATE jobs AS j
            SET status = 'superseded', finished_at = now(), lease_until = NULL,
                error = CASE WHEN j.scan_id <> t.latest_scan_id THEN @byScan ELSE @byVersion END
            FROM trees t
            WHERE t.tree_id = j.tree_id
              AND (j.status = 'queued' OR (j.status = 'running' AND j.lease_until <= now()))
              AND (j.scan_id <> t.latest_scan_id OR (j.kind = 'replan' AND j.base_version IS DISTINCT FROM t.current_version))
            """, cancellationToken, ("byScan", StoreText.SupersededByScan), ("byVersion", StoreText.SupersededByVersion)).ConfigureAwait(false);

        // One statement: lock the oldest claimable job that no other transaction holds, and take it. A queued
        // job waits while another job of its tree runs; two claims racing for two jobs of one tree meet at the
        // unique index of running jobs per tree, and the loser looks again. Every claim (first or take-over)
        // raises the attempt, so (job, attempt) names one claim.
        for (var tries = 0; ; tries++)
        {
            try
            {
                var rows = await QueryAsync(connection, null, """
                    WITH candidate AS (
                        SELECT j.job_id FROM jobs j
                        WHERE (j.status = 'queued' AND NOT EXISTS (SELECT 1 FROM jobs r WHERE r.tree_id = j.tree_id AND r.status = 'running'))
                           OR (j.status = 'running' AND j.lease_until <= now())
                        ORDER BY j.created_at, j.job_id
                        LIMIT 1
                        FOR UPDATE SKIP LOCKED)
                    UPDATE jobs AS j
                    SET status = 'running', attempt = j.attempt + 1, lease_owner = @worker, lease_until = now() + @lease
                    FROM candidate
                    WHERE j.job_id = candidate.job_id
                    """ + JobReturning, ReadJob, cancellationToken, ("worker", workerId), ("lease", lease)).ConfigureAwait(false);
                return rows.Count == 0 ? null : rows[0];
            }
            catch (PostgresException e) when (e.SqlState == PostgresErrorCodes.UniqueViolation && e.ConstraintName == OneRunningPerTree)
            {
                if (tries >= 4)
                {
                    return null;
                }
            }
        }
    }

    public async Task<LeaseRenewal> RenewLeaseAsync(string jobId, int attempt, string workerId, TimeSpan lease, CancellationToken cancellationToken)
    {
        var renewal = LeaseRenewal.Lost;
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            var held = await QueryAsync(connection, transaction, """
                SELECT j.tree_id FROM jobs j
                WHERE j.job_id = @job AND j.attempt = @attempt AND j.lease_owner = @worker AND j.status = 'running'
                FOR UPDATE
                """, r => r.GetString(0), ct, ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false);
            if (held.Count == 0)
            {
                return false;
            }

            if (await SupersededReasonAsync(connection, transaction, jobId, ct).ConfigureAwait(false) is { } reason)
            {
                await FinishSupersededAsync(connection, transaction, jobId, reason, ct).ConfigureAwait(false);
                renewal = LeaseRenewal.Superseded;
                return true;
            }

            await ExecuteAsync(connection, transaction, "UPDATE jobs SET lease_until = now() + @lease WHERE job_id = @job", ct, ("lease", lease), ("job", jobId)).ConfigureAwait(false);
            renewal = LeaseRenewal.Renewed;
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return renewal;
    }

    public async Task<bool> ReleaseJobAsync(string jobId, int attempt, string workerId, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            UPDATE jobs SET status = 'queued', lease_owner = NULL, lease_until = NULL
            WHERE job_id = @job AND attempt = @attempt AND lease_owner = @worker AND status = 'running'
            """, cancellationToken, ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false) == 1;
    }

    public async Task<CompletionResult> CompleteJobAsync(string jobId, int attempt, string workerId, ScheduleWrite result, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(result);
        var completion = new CompletionResult(CompletionStatus.NotHeld, null, null);
        await InTransactionAsync(async (connection, transaction, ct) =>
        {
            // Lock the job (fenced), then its tree: the tree's row lock orders results of one tree.
            var jobs = await QueryAsync(connection, transaction, """
                SELECT tree_id, scan_id FROM jobs
                WHERE job_id = @job AND attempt = @attempt AND lease_owner = @worker AND status = 'running'
                FOR UPDATE
                """, r => (Tree: r.GetString(0), Scan: r.GetString(1)), ct, ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false);
            if (jobs.Count == 0)
            {
                return false;
            }

            var (treeId, scanId) = jobs[0];
            var current = await ScalarAsync<int?>(connection, transaction, "SELECT current_version FROM trees WHERE tree_id = @tree FOR UPDATE", ct, ("tree", treeId)).ConfigureAwait(false);
            if (await SupersededReasonAsync(connection, transaction, jobId, ct).ConfigureAwait(false) is { } reason)
            {
                await FinishSupersededAsync(connection, transaction, jobId, reason, ct).ConfigureAwait(false);
                completion = new CompletionResult(CompletionStatus.Superseded, null, reason);
                return true;
            }

            var version = (current ?? 0) + 1;
            await ExecuteAsync(connection, transaction, """
                INSERT INTO schedules (tree_id, version, schedule_json, job_id, created_at, scan_id) VALUES (@tree, @version, @json, @job, now(), @scan)
                """, ct, ("tree", treeId), ("version", version), ("json", ScheduleDocuments.WithVersion(result.ScheduleJson, version)), ("job", jobId), ("scan", scanId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO plan_state (tree_id, scan_id, version, state_json, updated_at) VALUES (@tree, @scan, @version, @json, now())
                ON CONFLICT (tree_id, scan_id) DO UPDATE SET version = excluded.version, state_json = excluded.state_json, updated_at = excluded.updated_at
                """, ct, ("tree", treeId), ("scan", scanId), ("version", version), ("json", result.PlanStateJson)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                UPDATE trees SET current_version = @version, current_scan_id = @scan, total_seconds = @total, step_count = @steps,
                    unscheduled_count = @unscheduled, updated_at = now()
                WHERE tree_id = @tree
                """, ct, ("version", version), ("scan", scanId), ("total", result.TotalSeconds), ("steps", result.StepCount), ("unscheduled", result.UnscheduledCount),
                ("tree", treeId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'done', schedule_version = @version, finished_at = now(), lease_until = NULL WHERE job_id = @job
                """, ct, ("version", version), ("job", jobId)).ConfigureAwait(false);
            completion = new CompletionResult(CompletionStatus.Written, version, null);
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return completion;
    }

    public async Task<bool> FailJobAsync(string jobId, int attempt, string workerId, string reason, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            UPDATE jobs SET status = 'failed', error = @reason, finished_at = now(), lease_until = NULL
            WHERE job_id = @job AND attempt = @attempt AND lease_owner = @worker AND status = 'running'
            """, cancellationToken, ("reason", reason), ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false) == 1;
    }

    public async Task<TreeRecord?> GetTreeAsync(string treeId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(TreeSelect + " WHERE tree_id = @tree", ReadTree, cancellationToken, ("tree", treeId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<IReadOnlyList<TreeRecord>> ListTreesAsync(CancellationToken cancellationToken) =>
        QueryAsync(TreeSelect + " ORDER BY block COLLATE \"C\", row_label COLLATE \"C\", position_in_row, tree_id COLLATE \"C\"", ReadTree, cancellationToken);

    public Task<string?> GetScanAsync(string scanId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT scan_json FROM scans WHERE scan_id = @scan", cancellationToken, ("scan", scanId));

    public async Task<ScheduleRecord?> GetCurrentScheduleAsync(string treeId, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(ScheduleSelect + " WHERE tree_id = @tree ORDER BY version DESC LIMIT 1", ReadSchedule, cancellationToken, ("tree", treeId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<ScheduleRecord?> GetScheduleAsync(string treeId, int version, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(ScheduleSelect + " WHERE tree_id = @tree AND version = @version", ReadSchedule, cancellationToken, ("tree", treeId), ("version", version)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<string?> GetPlanStateAsync(string treeId, string scanId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT state_json FROM plan_state WHERE tree_id = @tree AND scan_id = @scan", cancellationToken, ("tree", treeId), ("scan", scanId));

    public async Task<OutcomeResult> RecordOutcomeAsync(OutcomeSubmission outcome, IdempotencyRequest? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        OutcomeResult? result = null;
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, ct) =>
        {
            var trees = await QueryAsync(connection, transaction, "SELECT current_version, current_scan_id, latest_scan_id FROM trees WHERE tree_id = @tree FOR UPDATE",
                r => (Version: r.IsDBNull(0) ? (int?)null : r.GetInt32(0), ScanId: r.IsDBNull(1) ? null : r.GetString(1), Latest: r.GetString(2)), ct, ("tree", outcome.TreeId)).ConfigureAwait(false);
            IReadOnlyList<OutcomeRecord> earlier = trees.Count == 0 || trees[0].ScanId is null ? [] : await QueryAsync(connection, transaction,
                OutcomeSelect + " WHERE tree_id = @tree AND scan_id = @scan AND cut_id = @cut ORDER BY outcome_id",
                ReadOutcome, ct, ("tree", outcome.TreeId), ("scan", trees[0].ScanId), ("cut", outcome.CutId)).ConfigureAwait(false);
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
                    WHERE tree_id = @tree AND kind = 'replan' AND scan_id = @scan AND base_version = @version AND status IN ('queued', 'running')
                    ORDER BY created_at LIMIT 1
                    """, ct, ("tree", outcome.TreeId), ("scan", scanId), ("version", outcome.Version)).ConfigureAwait(false);
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
                        VALUES (@job, @tree, 'replan', @scan, 'queued', 0, @payload, now(), @version, @who)
                        """, ct, ("job", replanJobId), ("tree", outcome.TreeId), ("scan", scanId), ("payload", outcome.ReplanPayload), ("version", outcome.Version),
                        ("who", outcome.RequestedBy)).ConfigureAwait(false);
                }
            }

            await ExecuteAsync(connection, transaction, """
                INSERT INTO outcomes (tree_id, version, cut_id, outcome, job_id, scan_id, reported_at)
                VALUES (@tree, @version, @cut, @outcome, @job, @scan, now())
                """, ct, ("tree", outcome.TreeId), ("version", outcome.Version), ("cut", outcome.CutId), ("outcome", StoreText.Of(outcome.Outcome)),
                ("job", replanJobId), ("scan", scanId)).ConfigureAwait(false);
            await AuditAsync(connection, transaction, new AuditEntry(outcome.RequestedBy, "outcome.recorded", outcome.TreeId, $"cut {outcome.CutId} {StoreText.Of(outcome.Outcome)} on version {outcome.Version}"), ct).ConfigureAwait(false);
            if (newJob)
            {
                await AuditAsync(connection, transaction, new AuditEntry(outcome.RequestedBy, "replan.enqueued", outcome.TreeId, $"re-plan job {replanJobId} of version {outcome.Version}"), ct).ConfigureAwait(false);
            }

            result = new OutcomeResult(OutcomeStatus.Accepted, outcome.Version, replanJobId, null);
            return (true, replanJobId);
        }, cancellationToken).ConfigureAwait(false);
        return replayed is not null ? new OutcomeResult(OutcomeStatus.Replayed, null, null, replayed) : result!;
    }

    public Task<IReadOnlyList<OutcomeRecord>> ListOutcomesAsync(string treeId, string scanId, CancellationToken cancellationToken) =>
        QueryAsync(OutcomeSelect + " WHERE tree_id = @tree AND scan_id = @scan ORDER BY reported_at, outcome_id", ReadOutcome, cancellationToken, ("tree", treeId), ("scan", scanId));

    public async Task<QueueFigures> GetQueueFiguresAsync(CancellationToken cancellationToken)
    {
        var rows = await QueryAsync("""
            SELECT count(*) FILTER (WHERE status = 'queued'),
                   count(*) FILTER (WHERE status = 'running'),
                   COALESCE(EXTRACT(EPOCH FROM now() - min(created_at) FILTER (WHERE status = 'queued')), 0)::float8
            FROM jobs
            """,
            r => new QueueFigures(r.GetInt64(0), r.GetInt64(1), Math.Max(0, r.GetDouble(2))),
            cancellationToken).ConfigureAwait(false);
        return rows[0];
    }

    public async Task<IReadOnlyDictionary<string, long>> CountRowsAsync(CancellationToken cancellationToken)
    {
        // Table names come from the fixed list, never from input.
        var sql = string.Join(", ", StoreTables.All.Select(t => $"(SELECT count(*) FROM {t})"));
        var rows = await QueryAsync("SELECT " + sql, r =>
        {
            var counts = new Dictionary<string, long>(StringComparer.Ordinal);
            for (var i = 0; i < StoreTables.All.Count; i++)
            {
                counts[StoreTables.All[i]] = r.GetInt64(i);
            }

            return counts;
        }, cancellationToken).ConfigureAwait(false);
        return rows[0];
    }

    public ValueTask DisposeAsync() => dataSource.DisposeAsync();

    public void Dispose() => dataSource.Dispose();

    private const string OneRunningPerTree = "jobs_one_running_per_tree";

    private const string JobColumns = "job_id, tree_id, kind, scan_id, status, attempt, lease_owner, lease_until, payload_json, error, schedule_version, created_at, finished_at, base_version, requested_by";

    private const string JobSelect = "SELECT " + JobColumns;

    private const string JobReturning = """

        RETURNING j.job_id, j.tree_id, j.kind, j.scan_id, j.status, j.attempt, j.lease_owner, j.lease_until,
                  j.payload_json, j.error, j.schedule_version, j.created_at, j.finished_at, j.base_version, j.requested_by
        """;

    private const string TreeSelect = """
        SELECT tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy,
               current_version, total_seconds, step_count, unscheduled_count, updated_at, current_scan_id
        FROM trees
        """;

    private const string KeySelect = "SELECT key_id, role, secret_hash_hex, label, created_at, expires_at, revoked_at, last_used_at, demo FROM api_keys";

    private const string ScheduleSelect = "SELECT tree_id, version, schedule_json, job_id, created_at, scan_id FROM schedules";

    private const string OutcomeSelect = "SELECT tree_id, version, cut_id, outcome, reported_at, scan_id FROM outcomes";

    private static JobRecord ReadJob(DbDataReader r) => new(
        r.GetString(0), r.GetString(1), StoreText.JobKindOf(r.GetString(2)), r.GetString(3), StoreText.JobStatusOf(r.GetString(4)), r.GetInt32(5),
        r.IsDBNull(6) ? null : r.GetString(6),
        r.IsDBNull(7) ? null : r.GetFieldValue<DateTimeOffset>(7),
        r.IsDBNull(8) ? null : r.GetString(8),
        r.IsDBNull(9) ? null : r.GetString(9),
        r.IsDBNull(10) ? null : r.GetInt32(10),
        r.GetFieldValue<DateTimeOffset>(11),
        r.IsDBNull(12) ? null : r.GetFieldValue<DateTimeOffset>(12),
        r.IsDBNull(13) ? null : r.GetInt32(13),
        r.IsDBNull(14) ? null : r.GetString(14));

    private static TreeRecord ReadTree(DbDataReader r) => new(
        r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.GetString(5), StoreText.RetryPolicyOf(r.GetString(6)),
        r.IsDBNull(7) ? null : r.GetInt32(7),
        r.IsDBNull(8) ? null : r.GetDouble(8),
        r.IsDBNull(9) ? null : r.GetInt32(9),
        r.IsDBNull(10) ? null : r.GetInt32(10),
        r.GetFieldValue<DateTimeOffset>(11),
        r.IsDBNull(12) ? null : r.GetString(12));

    private static ApiKeyRecord ReadKey(DbDataReader r) => ReadKey(r, 0);

    private static ApiKeyRecord ReadKey(DbDataReader r, int at) => new(r.GetString(at), r.GetString(at + 1), r.GetString(at + 2), r.GetString(at + 3), r.GetFieldValue<DateTimeOffset>(at + 4))
    {
        ExpiresAt = r.IsDBNull(at + 5) ? null : r.GetFieldValue<DateTimeOffset>(at + 5),
        RevokedAt = r.IsDBNull(at + 6) ? null : r.GetFieldValue<DateTimeOffset>(at + 6),
        LastUsedAt = r.IsDBNull(at + 7) ? null : r.GetFieldValue<DateTimeOffset>(at + 7),
        Demo = r.GetBoolean(at + 8),
    };

    private static ScheduleRecord ReadSchedule(DbDataReader r) =>
        new(r.GetString(0), r.GetInt32(1), r.GetString(2), r.GetString(3), r.GetFieldValue<DateTimeOffset>(4), r.GetString(5));

    private static OutcomeRecord ReadOutcome(DbDataReader r) =>
        new(r.GetString(0), r.GetInt32(1), r.GetString(2), StoreText.CutOutcomeOf(r.GetString(3)), r.GetFieldValue<DateTimeOffset>(4), r.GetString(5));

    private static async Task<int> OpenJobsOfAsync(NpgsqlConnection connection, NpgsqlTransaction transaction, string requester, CancellationToken ct)
    {
        // One requester's intake is serialised here, so two requests cannot both take the last place.
        await ExecuteAsync(connection, transaction, "SELECT pg_advisory_xact_lock(hashtextextended(@who, 1))", ct, ("who", "orchard:requester:" + requester)).ConfigureAwait(false);
        return (int)await ScalarAsync<long>(connection, transaction, "SELECT count(*) FROM jobs WHERE requested_by = @who AND status IN ('queued', 'running')", ct, ("who", requester)).ConfigureAwait(false);
    }

    /// <summary>Why a job can only write a superseded result (its scan is not the tree's newest, or it re-plans a version that is not current); null when it is current.</summary>
    private static Task<string?> SupersededReasonAsync(NpgsqlConnection connection, NpgsqlTransaction transaction, string jobId, CancellationToken ct) =>
        ScalarAsync<string>(connection, transaction, """
            SELECT CASE WHEN j.scan_id <> t.latest_scan_id THEN @byScan
                        WHEN j.kind = 'replan' AND j.base_version IS DISTINCT FROM t.current_version THEN @byVersion END
            FROM jobs j JOIN trees t ON t.tree_id = j.tree_id
            WHERE j.job_id = @job
            """, ct, ("byScan", StoreText.SupersededByScan), ("byVersion", StoreText.SupersededByVersion), ("job", jobId));

    private static Task<int> FinishSupersededAsync(NpgsqlConnection connection, NpgsqlTransaction transaction, string jobId, string reason, CancellationToken ct) =>
        ExecuteAsync(connection, transaction, "UPDATE jobs SET status = 'superseded', error = @reason, finished_at = now(), lease_until = NULL WHERE job_id = @job",
            ct, ("reason", reason), ("job", jobId));

    private static Task<int> AuditAsync(NpgsqlConnection connection, NpgsqlTransaction? transaction, AuditEntry entry, CancellationToken ct) =>
        ExecuteAsync(connection, transaction, "INSERT INTO audit (at, key_id, action, target, detail) VALUES (now(), @key, @action, @target, @detail)",
            ct, ("key", entry.KeyId), ("action", entry.Action), ("target", entry.Target), ("detail", entry.Detail));

    private static async Task<IdempotencyRecord?> ReadIdempotencyAsync(NpgsqlConnection connection, string scope, string key, CancellationToken ct)
    {
        var rows = await QueryAsync(connection, null,
            "SELECT scope, key, request_hash_hex, status_code, response_json, location FROM idempotency WHERE scope = @scope AND key = @key",
            r => new IdempotencyRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.IsDBNull(5) ? null : r.GetString(5)),
            ct,
            ("scope", scope), ("key", key)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    /// <summary>One transaction; the body returns true to commit, false to roll back.</summary>
    private async Task InTransactionAsync(Func<NpgsqlConnection, NpgsqlTransaction, CancellationToken, Task<bool>> body, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken).ConfigureAwait(false);
        if (await body(connection, transaction, cancellationToken).ConfigureAwait(false))
        {
            await transaction.CommitAsync(cancellationToken).ConfigureAwait(false);
        }
        else
        {
            await transaction.RollbackAsync(cancellationToken).ConfigureAwait(false);
        }
    }

    /// <summary>
    /// Runs <paramref name="body"/> in one transaction that first stores the idempotency key (if any). A
    /// record already stored (or being stored by a concurrent transaction, which the insert waits for) under
    /// the same (scope, key) makes the primary key refuse the insert: the transaction is rolled back and the
    /// stored record returned. The body returns whether to commit and the job id its answer names; on commit,
    /// the answer made from it is what a replay returns.
    /// </summary>
    private async Task<IdempotencyRecord?> WriteIdempotentAsync(
        IdempotencyRequest? idempotency,
        Func<NpgsqlConnection, NpgsqlTransaction, CancellationToken, Task<(bool Commit, string? JobId)>> body,
        CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await using (var transaction = await connection.BeginTransactionAsync(cancellationToken).ConfigureAwait(false))
        {
            var duplicate = false;
            if (idempotency is not null)
            {
                try
                {
                    await ExecuteAsync(connection, transaction, """
                        INSERT INTO idempotency (scope, key, request_hash_hex, status_code, response_json, location, created_at)
                        VALUES (@scope, @key, @hash, 0, '', NULL, now())
                        """, cancellationToken, ("scope", idempotency.Scope), ("key", idempotency.Key), ("hash", idempotency.RequestHashHex)).ConfigureAwait(false);
                }
                catch (PostgresException e) when (e.SqlState == PostgresErrorCodes.UniqueViolation && e.ConstraintName == IdempotencyConstraint)
                {
                    duplicate = true;
                }
            }

            if (!duplicate)
            {
                var (commit, jobId) = await body(connection, transaction, cancellationToken).ConfigureAwait(false);
                if (commit)
                {
                    if (idempotency is not null)
                    {
                        var answer = idempotency.Answer(jobId);
                        await ExecuteAsync(connection, transaction, """
                            UPDATE idempotency SET status_code = @status, response_json = @response, location = @location WHERE scope = @scope AND key = @key
                            """, cancellationToken, ("status", answer.StatusCode), ("response", answer.ResponseJson), ("location", answer.Location),
                            ("scope", idempotency.Scope), ("key", idempotency.Key)).ConfigureAwait(false);
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

        return await ReadIdempotencyAsync(connection, idempotency!.Scope, idempotency.Key, cancellationToken).ConfigureAwait(false)
            ?? throw new InvalidOperationException("The idempotency record that refused the insert is gone.");
    }

    private static Task<int> ExecuteAsync(NpgsqlConnection connection, NpgsqlTransaction? transaction, string sql, CancellationToken ct, params (string Name, object? Value)[] parameters) =>
        SqlCommands.ExecuteAsync(connection, transaction, sql, ct, parameters);

    private static Task<T?> ScalarAsync<T>(NpgsqlConnection connection, NpgsqlTransaction? transaction, string sql, CancellationToken ct, params (string Name, object? Value)[] parameters) =>
        SqlCommands.ScalarAsync<T>(connection, transaction, sql, ct, parameters);

    private async Task<T?> ScalarAsync<T>(string sql, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var connection = await dataSource.OpenConnectionAsync(ct).ConfigureAwait(false);
        return await SqlCommands.ScalarAsync<T>(connection, null, sql, ct, parameters).ConfigureAwait(false);
    }

    private static Task<IReadOnlyList<T>> QueryAsync<T>(NpgsqlConnection connection, NpgsqlTransaction? transaction, string sql, Func<DbDataReader, T> map, CancellationToken ct, params (string Name, object? Value)[] parameters) =>
        SqlCommands.QueryAsync(connection, transaction, sql, map, ct, parameters);

    private async Task<IReadOnlyList<T>> QueryAsync<T>(string sql, Func<DbDataReader, T> map, CancellationToken ct, params (string Name, object? Value)[] parameters)
    {
        await using var connection = await dataSource.OpenConnectionAsync(ct).ConfigureAwait(false);
        return await SqlCommands.QueryAsync(connection, null, sql, map, ct, parameters).ConfigureAwait(false);
    }
}
