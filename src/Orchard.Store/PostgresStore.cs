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

    public async Task PutArmProfileAsync(string armId, string json, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await ExecuteAsync(connection, null, """
            INSERT INTO arm_profiles (arm_id, profile_json, updated_at) VALUES (@id, @json, now())
            ON CONFLICT (arm_id) DO UPDATE SET profile_json = excluded.profile_json, updated_at = excluded.updated_at
            """, cancellationToken, ("id", armId), ("json", json)).ConfigureAwait(false);
    }

    public Task<string?> GetArmProfileAsync(string armId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT profile_json FROM arm_profiles WHERE arm_id = @id", cancellationToken, ("id", armId));

    public Task<IReadOnlyList<string>> ListArmProfileIdsAsync(CancellationToken cancellationToken) =>
        QueryAsync("SELECT arm_id FROM arm_profiles ORDER BY arm_id COLLATE \"C\"", r => r.GetString(0), cancellationToken);

    public async Task AddApiKeyAsync(ApiKeyRecord key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(key);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await ExecuteAsync(connection, null, """
            INSERT INTO api_keys (key_id, role, secret_hash_hex, label, created_at) VALUES (@id, @role, @hash, @label, @at)
            """, cancellationToken, ("id", key.KeyId), ("role", key.Role), ("hash", key.SecretHashHex), ("label", key.Label), ("at", key.CreatedAt.ToUniversalTime())).ConfigureAwait(false);
    }

    public async Task<ApiKeyRecord?> FindApiKeyAsync(string secretHashHex, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(
            "SELECT key_id, role, secret_hash_hex, label, created_at FROM api_keys WHERE secret_hash_hex = @hash",
            r => new ApiKeyRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetString(3), r.GetFieldValue<DateTimeOffset>(4)),
            cancellationToken,
            ("hash", secretHashHex)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<int> CountApiKeysAsync(CancellationToken cancellationToken) =>
        (int)await ScalarAsync<long>("SELECT count(*) FROM api_keys", cancellationToken).ConfigureAwait(false);

    public async Task<AcceptResult> AcceptScanAsync(ScanSubmission scan, IdempotencyRecord? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO trees (tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy, updated_at)
                VALUES (@tree, @block, @row, @pos, @arm, @scan, @retry, now())
                ON CONFLICT (tree_id) DO UPDATE SET block = excluded.block, row_label = excluded.row_label,
                    position_in_row = excluded.position_in_row, arm_profile_id = excluded.arm_profile_id,
                    latest_scan_id = excluded.latest_scan_id, retry_policy = excluded.retry_policy, updated_at = excluded.updated_at
                """, ct, ("tree", scan.TreeId), ("block", scan.Block), ("row", scan.Row), ("pos", scan.PositionInRow),
                ("arm", scan.ArmProfileId), ("scan", scan.ScanId), ("retry", scan.RetryPolicy)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO scans (scan_id, tree_id, scan_json, created_at) VALUES (@scan, @tree, @json, now())
                """, ct, ("scan", scan.ScanId), ("tree", scan.TreeId), ("json", scan.ScanJson)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, created_at)
                VALUES (@job, @tree, 'plan', @scan, 'queued', 0, now())
                """, ct, ("job", scan.JobId), ("tree", scan.TreeId), ("scan", scan.ScanId)).ConfigureAwait(false);
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return replayed is null ? new AcceptResult(true, null) : new AcceptResult(false, replayed);
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

        // One statement: lock the oldest claimable job that no other transaction holds, and take it.
        // Every claim (first or take-over) raises the attempt, so (job, attempt) names one claim.
        var rows = await QueryAsync(connection, null, """
            WITH candidate AS (
                SELECT job_id FROM jobs
                WHERE status = 'queued' OR (status = 'running' AND lease_until <= now())
                ORDER BY created_at, job_id
                LIMIT 1
                FOR UPDATE SKIP LOCKED)
            UPDATE jobs AS j
            SET status = 'running', attempt = j.attempt + 1, lease_owner = @worker, lease_until = now() + @lease
            FROM candidate
            WHERE j.job_id = candidate.job_id
            """ + JobReturning, ReadJob, cancellationToken, ("worker", workerId), ("lease", lease)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<bool> RenewLeaseAsync(string jobId, int attempt, string workerId, TimeSpan lease, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            UPDATE jobs SET lease_until = now() + @lease
            WHERE job_id = @job AND attempt = @attempt AND lease_owner = @worker AND status = 'running'
            """, cancellationToken, ("lease", lease), ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false) == 1;
    }

    public async Task<bool> ReleaseJobAsync(string jobId, int attempt, string workerId, CancellationToken cancellationToken)
    {
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        return await ExecuteAsync(connection, null, """
            UPDATE jobs SET status = 'queued', lease_owner = NULL, lease_until = NULL
            WHERE job_id = @job AND attempt = @attempt AND lease_owner = @worker AND status = 'running'
            """, cancellationToken, ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false) == 1;
    }

    public async Task<bool> CompleteJobAsync(string jobId, int attempt, string workerId, ScheduleWrite result, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(result);
        await using var connection = await dataSource.OpenConnectionAsync(cancellationToken).ConfigureAwait(false);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken).ConfigureAwait(false);
        // Lock the job (fenced), then its tree: the tree's row lock orders results of one tree.
        var treeId = await ScalarAsync<string>(connection, transaction, """
            SELECT tree_id FROM jobs
            WHERE job_id = @job AND attempt = @attempt AND lease_owner = @worker AND status = 'running'
            FOR UPDATE
            """, cancellationToken, ("job", jobId), ("attempt", attempt), ("worker", workerId)).ConfigureAwait(false);
        if (treeId is null)
        {
            await transaction.RollbackAsync(cancellationToken).ConfigureAwait(false);
            return false;
        }

        var current = await ScalarAsync<int?>(connection, transaction, "SELECT current_version FROM trees WHERE tree_id = @tree FOR UPDATE", cancellationToken, ("tree", treeId)).ConfigureAwait(false);
        var version = (current ?? 0) + 1;
        await ExecuteAsync(connection, transaction, """
            INSERT INTO schedules (tree_id, version, schedule_json, job_id, created_at) VALUES (@tree, @version, @json, @job, now())
            """, cancellationToken, ("tree", treeId), ("version", version), ("json", result.ScheduleJson), ("job", jobId)).ConfigureAwait(false);
        await ExecuteAsync(connection, transaction, """
            INSERT INTO plan_state (tree_id, version, state_json, updated_at) VALUES (@tree, @version, @json, now())
            ON CONFLICT (tree_id) DO UPDATE SET version = excluded.version, state_json = excluded.state_json, updated_at = excluded.updated_at
            """, cancellationToken, ("tree", treeId), ("version", version), ("json", result.PlanStateJson)).ConfigureAwait(false);
        await ExecuteAsync(connection, transaction, """
            UPDATE trees SET current_version = @version, total_seconds = @total, step_count = @steps, unscheduled_count = @unscheduled, updated_at = now()
            WHERE tree_id = @tree
            """, cancellationToken, ("version", version), ("total", result.TotalSeconds), ("steps", result.StepCount), ("unscheduled", result.UnscheduledCount),
            ("tree", treeId)).ConfigureAwait(false);
        await ExecuteAsync(connection, transaction, """
            UPDATE jobs SET status = 'done', schedule_version = @version, finished_at = now(), lease_until = NULL WHERE job_id = @job
            """, cancellationToken, ("version", version), ("job", jobId)).ConfigureAwait(false);
        await transaction.CommitAsync(cancellationToken).ConfigureAwait(false);
        return true;
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
        var rows = await QueryAsync(
            "SELECT tree_id, version, schedule_json, job_id, created_at FROM schedules WHERE tree_id = @tree ORDER BY version DESC LIMIT 1",
            r => new ScheduleRecord(r.GetString(0), r.GetInt32(1), r.GetString(2), r.GetString(3), r.GetFieldValue<DateTimeOffset>(4)),
            cancellationToken,
            ("tree", treeId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<string?> GetPlanStateAsync(string treeId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT state_json FROM plan_state WHERE tree_id = @tree", cancellationToken, ("tree", treeId));

    public async Task<OutcomeResult> RecordOutcomeAsync(OutcomeSubmission outcome, string? replanPayload, IdempotencyRecord? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        OutcomeResult? result = null;
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, ct) =>
        {
            var tree = await QueryAsync(connection, transaction, "SELECT current_version, latest_scan_id FROM trees WHERE tree_id = @tree FOR UPDATE",
                r => (Version: r.IsDBNull(0) ? (int?)null : r.GetInt32(0), ScanId: r.GetString(1)), ct, ("tree", outcome.TreeId)).ConfigureAwait(false);
            if (tree.Count == 0 || tree[0].Version != outcome.Version)
            {
                result = new OutcomeResult(false, tree.Count == 0 ? null : tree[0].Version, null, null);
                return false;
            }

            await ExecuteAsync(connection, transaction, """
                INSERT INTO outcomes (tree_id, version, cut_id, outcome, job_id, scan_id, reported_at)
                VALUES (@tree, @version, @cut, @outcome, @job, @scan, now())
                """, ct, ("tree", outcome.TreeId), ("version", outcome.Version), ("cut", outcome.CutId), ("outcome", outcome.Outcome),
                ("job", outcome.JobId), ("scan", outcome.ScanId)).ConfigureAwait(false);
            string? replanJobId = null;
            if (outcome.Outcome == "missed" && replanPayload is not null)
            {
                replanJobId = StoreTables.NewReplanJobId();
                await ExecuteAsync(connection, transaction, """
                    INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, payload_json, created_at)
                    VALUES (@job, @tree, 'replan', @scan, 'queued', 0, @payload, now())
                    """, ct, ("job", replanJobId), ("tree", outcome.TreeId), ("scan", tree[0].ScanId), ("payload", replanPayload)).ConfigureAwait(false);
            }

            result = new OutcomeResult(true, outcome.Version, replanJobId, null);
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return replayed is not null ? new OutcomeResult(false, null, null, replayed) : result!;
    }

    public Task<IReadOnlyList<OutcomeRecord>> ListOutcomesAsync(string treeId, CancellationToken cancellationToken) =>
        QueryAsync(
            "SELECT tree_id, version, cut_id, outcome, reported_at FROM outcomes WHERE tree_id = @tree ORDER BY reported_at, outcome_id",
            r => new OutcomeRecord(r.GetString(0), r.GetInt32(1), r.GetString(2), r.GetString(3), r.GetFieldValue<DateTimeOffset>(4)),
            cancellationToken,
            ("tree", treeId));

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

    private const string JobColumns = "job_id, tree_id, kind, scan_id, status, attempt, lease_owner, lease_until, payload_json, error, schedule_version, created_at, finished_at";

    private const string JobSelect = "SELECT " + JobColumns;

    private const string JobReturning = """

        RETURNING j.job_id, j.tree_id, j.kind, j.scan_id, j.status, j.attempt, j.lease_owner, j.lease_until,
                  j.payload_json, j.error, j.schedule_version, j.created_at, j.finished_at
        """;

    private const string TreeSelect = """
        SELECT tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy,
               current_version, total_seconds, step_count, unscheduled_count, updated_at
        FROM trees
        """;

    private static JobRecord ReadJob(DbDataReader r) => new(
        r.GetString(0), r.GetString(1), r.GetString(2), r.GetString(3), r.GetString(4), r.GetInt32(5),
        r.IsDBNull(6) ? null : r.GetString(6),
        r.IsDBNull(7) ? null : r.GetFieldValue<DateTimeOffset>(7),
        r.IsDBNull(8) ? null : r.GetString(8),
        r.IsDBNull(9) ? null : r.GetString(9),
        r.IsDBNull(10) ? null : r.GetInt32(10),
        r.GetFieldValue<DateTimeOffset>(11),
        r.IsDBNull(12) ? null : r.GetFieldValue<DateTimeOffset>(12));

    private static TreeRecord ReadTree(DbDataReader r) => new(
        r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.GetString(5), r.GetString(6),
        r.IsDBNull(7) ? null : r.GetInt32(7),
        r.IsDBNull(8) ? null : r.GetDouble(8),
        r.IsDBNull(9) ? null : r.GetInt32(9),
        r.IsDBNull(10) ? null : r.GetInt32(10),
        r.GetFieldValue<DateTimeOffset>(11));

    private static async Task<IdempotencyRecord?> ReadIdempotencyAsync(NpgsqlConnection connection, string scope, string key, CancellationToken ct)
    {
        var rows = await QueryAsync(connection, null,
            "SELECT scope, key, request_hash_hex, status_code, response_json, location FROM idempotency WHERE scope = @scope AND key = @key",
            r => new IdempotencyRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.IsDBNull(5) ? null : r.GetString(5)),
            ct,
            ("scope", scope), ("key", key)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    /// <summary>
    /// Runs <paramref name="body"/> in one transaction that first stores the idempotency record (if any). A
    /// record already stored (or being stored by a concurrent transaction, which the insert waits for) under
    /// the same (scope, key) makes the primary key refuse the insert: the transaction is rolled back and the
    /// stored record returned. The body returns false to roll back (a refused request).
    /// </summary>
    private async Task<IdempotencyRecord?> WriteIdempotentAsync(
        IdempotencyRecord? idempotency,
        Func<NpgsqlConnection, NpgsqlTransaction, CancellationToken, Task<bool>> body,
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
                        VALUES (@scope, @key, @hash, @status, @response, @location, now())
                        """, cancellationToken, ("scope", idempotency.Scope), ("key", idempotency.Key), ("hash", idempotency.RequestHashHex),
                        ("status", idempotency.StatusCode), ("response", idempotency.ResponseJson), ("location", idempotency.Location)).ConfigureAwait(false);
                }
                catch (PostgresException e) when (e.SqlState == PostgresErrorCodes.UniqueViolation && e.ConstraintName == IdempotencyConstraint)
                {
                    duplicate = true;
                }
            }

            if (!duplicate)
            {
                if (await body(connection, transaction, cancellationToken).ConfigureAwait(false))
                {
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
