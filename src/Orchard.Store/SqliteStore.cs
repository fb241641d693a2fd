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
            await using (var connection = await OpenAsync(cancellationToken).ConfigureAwait(false))
            {
                await using var wal = connection.CreateCommand();
                wal.CommandText = "PRAGMA journal_mode = WAL;";
                await wal.ExecuteNonQueryAsync(cancellationToken).ConfigureAwait(false);
            }

            var upgrader = DeployChanges.To
                .SqliteDatabase(connectionString)
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
        }
        finally
        {
            writeLock.Release();
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

    public Task PutArmProfileAsync(string armId, string json, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO arm_profiles (arm_id, profile_json, updated_at) VALUES ($id, $json, $now)
                ON CONFLICT (arm_id) DO UPDATE SET profile_json = excluded.profile_json, updated_at = excluded.updated_at
                """, ct, ("$id", armId), ("$json", json), ("$now", Now()));
            return true;
        }, cancellationToken);

    public async Task<string?> GetArmProfileAsync(string armId, CancellationToken cancellationToken) =>
        await ScalarAsync<string>("SELECT profile_json FROM arm_profiles WHERE arm_id = $id", cancellationToken, ("$id", armId)).ConfigureAwait(false);

    public Task<IReadOnlyList<string>> ListArmProfileIdsAsync(CancellationToken cancellationToken) =>
        QueryAsync("SELECT arm_id FROM arm_profiles ORDER BY arm_id", r => r.GetString(0), cancellationToken);

    public Task AddApiKeyAsync(ApiKeyRecord key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(key);
        return WriteAsync(async (connection, transaction, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO api_keys (key_id, role, secret_hash_hex, label, created_at) VALUES ($id, $role, $hash, $label, $at)
                """, ct, ("$id", key.KeyId), ("$role", key.Role), ("$hash", key.SecretHashHex), ("$label", key.Label), ("$at", ToMicros(key.CreatedAt)));
            return true;
        }, cancellationToken);
    }

    public async Task<ApiKeyRecord?> FindApiKeyAsync(string secretHashHex, CancellationToken cancellationToken)
    {
        var rows = await QueryAsync(
            "SELECT key_id, role, secret_hash_hex, label, created_at FROM api_keys WHERE secret_hash_hex = $hash",
            r => new ApiKeyRecord(r.GetString(0), r.GetString(1), r.GetString(2), r.GetString(3), FromMicros(r.GetInt64(4))),
            cancellationToken,
            ("$hash", secretHashHex)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public async Task<int> CountApiKeysAsync(CancellationToken cancellationToken) =>
        (int)await ScalarAsync<long>("SELECT count(*) FROM api_keys", cancellationToken).ConfigureAwait(false);

    public async Task<AcceptResult> AcceptScanAsync(ScanSubmission scan, IdempotencyRecord? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, now, ct) =>
        {
            await ExecuteAsync(connection, transaction, """
                INSERT INTO trees (tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy, updated_at)
                VALUES ($tree, $block, $row, $pos, $arm, $scan, $retry, $now)
                ON CONFLICT (tree_id) DO UPDATE SET block = excluded.block, row_label = excluded.row_label,
                    position_in_row = excluded.position_in_row, arm_profile_id = excluded.arm_profile_id,
                    latest_scan_id = excluded.latest_scan_id, retry_policy = excluded.retry_policy, updated_at = excluded.updated_at
                """, ct, ("$tree", scan.TreeId), ("$block", scan.Block), ("$row", scan.Row), ("$pos", scan.PositionInRow),
                ("$arm", scan.ArmProfileId), ("$scan", scan.ScanId), ("$retry", scan.RetryPolicy), ("$now", now));
            await ExecuteAsync(connection, transaction, """
                INSERT INTO scans (scan_id, tree_id, scan_json, created_at) VALUES ($scan, $tree, $json, $now)
                """, ct, ("$scan", scan.ScanId), ("$tree", scan.TreeId), ("$json", scan.ScanJson), ("$now", now));
            await ExecuteAsync(connection, transaction, """
                INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, created_at)
                VALUES ($job, $tree, 'plan', $scan, 'queued', 0, $now)
                """, ct, ("$job", scan.JobId), ("$tree", scan.TreeId), ("$scan", scan.ScanId), ("$now", now));
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return replayed is null ? new AcceptResult(true, null) : new AcceptResult(false, replayed);
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
            var jobId = await ScalarAsync<string>(connection, transaction, """
                SELECT job_id FROM jobs
                WHERE status = 'queued' OR (status = 'running' AND lease_until <= $now)
                ORDER BY created_at, job_id
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

    public Task<bool> RenewLeaseAsync(string jobId, int attempt, string workerId, TimeSpan lease, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET lease_until = $until
                WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, ct, ("$until", Now() + ToMicros(lease)), ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false) == 1,
            cancellationToken);

    public Task<bool> ReleaseJobAsync(string jobId, int attempt, string workerId, CancellationToken cancellationToken) =>
        WriteAsync(async (connection, transaction, ct) =>
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'queued', lease_owner = NULL, lease_until = NULL
                WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, ct, ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false) == 1,
            cancellationToken);

    public Task<bool> CompleteJobAsync(string jobId, int attempt, string workerId, ScheduleWrite result, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(result);
        return WriteAsync(async (connection, transaction, ct) =>
        {
            var treeId = await ScalarAsync<string>(connection, transaction, """
                SELECT tree_id FROM jobs
                WHERE job_id = $job AND attempt = $attempt AND lease_owner = $worker AND status = 'running'
                """, ct, ("$job", jobId), ("$attempt", attempt), ("$worker", workerId)).ConfigureAwait(false);
            if (treeId is null)
            {
                return false;
            }

            var now = Now();
            var current = await ScalarAsync<long?>(connection, transaction, "SELECT current_version FROM trees WHERE tree_id = $tree", ct, ("$tree", treeId)).ConfigureAwait(false);
            var version = (int)(current ?? 0) + 1;
            await ExecuteAsync(connection, transaction, """
                INSERT INTO schedules (tree_id, version, schedule_json, job_id, created_at) VALUES ($tree, $version, $json, $job, $now)
                """, ct, ("$tree", treeId), ("$version", version), ("$json", result.ScheduleJson), ("$job", jobId), ("$now", now)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                INSERT INTO plan_state (tree_id, version, state_json, updated_at) VALUES ($tree, $version, $json, $now)
                ON CONFLICT (tree_id) DO UPDATE SET version = excluded.version, state_json = excluded.state_json, updated_at = excluded.updated_at
                """, ct, ("$tree", treeId), ("$version", version), ("$json", result.PlanStateJson), ("$now", now)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                UPDATE trees SET current_version = $version, total_seconds = $total, step_count = $steps, unscheduled_count = $unscheduled, updated_at = $now
                WHERE tree_id = $tree
                """, ct, ("$version", version), ("$total", result.TotalSeconds), ("$steps", result.StepCount), ("$unscheduled", result.UnscheduledCount),
                ("$now", now), ("$tree", treeId)).ConfigureAwait(false);
            await ExecuteAsync(connection, transaction, """
                UPDATE jobs SET status = 'done', schedule_version = $version, finished_at = $now, lease_until = NULL WHERE job_id = $job
                """, ct, ("$version", version), ("$now", now), ("$job", jobId)).ConfigureAwait(false);
            return true;
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
        var rows = await QueryAsync(
            "SELECT tree_id, version, schedule_json, job_id, created_at FROM schedules WHERE tree_id = $tree ORDER BY version DESC LIMIT 1",
            r => new ScheduleRecord(r.GetString(0), r.GetInt32(1), r.GetString(2), r.GetString(3), FromMicros(r.GetInt64(4))),
            cancellationToken,
            ("$tree", treeId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

    public Task<string?> GetPlanStateAsync(string treeId, CancellationToken cancellationToken) =>
        ScalarAsync<string>("SELECT state_json FROM plan_state WHERE tree_id = $tree", cancellationToken, ("$tree", treeId));

    public async Task<OutcomeResult> RecordOutcomeAsync(OutcomeSubmission outcome, string? replanPayload, IdempotencyRecord? idempotency, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outcome);
        OutcomeResult? result = null;
        var replayed = await WriteIdempotentAsync(idempotency, async (connection, transaction, now, ct) =>
        {
            var tree = await QueryAsync(connection, transaction, "SELECT current_version, latest_scan_id FROM trees WHERE tree_id = $tree",
                r => (Version: r.IsDBNull(0) ? (int?)null : r.GetInt32(0), ScanId: r.GetString(1)), ct, ("$tree", outcome.TreeId)).ConfigureAwait(false);
            if (tree.Count == 0 || tree[0].Version != outcome.Version)
            {
                result = new OutcomeResult(false, tree.Count == 0 ? null : tree[0].Version, null, null);
                return false;
            }

            await ExecuteAsync(connection, transaction, """
                INSERT INTO outcomes (tree_id, version, cut_id, outcome, job_id, scan_id, reported_at)
                VALUES ($tree, $version, $cut, $outcome, $job, $scan, $now)
                """, ct, ("$tree", outcome.TreeId), ("$version", outcome.Version), ("$cut", outcome.CutId), ("$outcome", outcome.Outcome),
                ("$job", outcome.JobId), ("$scan", outcome.ScanId), ("$now", now)).ConfigureAwait(false);
            string? replanJobId = null;
            if (outcome.Outcome == "missed" && replanPayload is not null)
            {
                replanJobId = StoreTables.NewReplanJobId();
                await ExecuteAsync(connection, transaction, """
                    INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, payload_json, created_at)
                    VALUES ($job, $tree, 'replan', $scan, 'queued', 0, $payload, $now)
                    """, ct, ("$job", replanJobId), ("$tree", outcome.TreeId), ("$scan", tree[0].ScanId), ("$payload", replanPayload), ("$now", now)).ConfigureAwait(false);
            }

            result = new OutcomeResult(true, outcome.Version, replanJobId, null);
            return true;
        }, cancellationToken).ConfigureAwait(false);
        return replayed is not null ? new OutcomeResult(false, null, null, replayed) : result!;
    }

    public Task<IReadOnlyList<OutcomeRecord>> ListOutcomesAsync(string treeId, CancellationToken cancellationToken) =>
        QueryAsync(
            "SELECT tree_id, version, cut_id, outcome, reported_at FROM outcomes WHERE tree_id = $tree ORDER BY reported_at, outcome_id",
            r => new OutcomeRecord(r.GetString(0), r.GetInt32(1), r.GetString(2), r.GetString(3), FromMicros(r.GetInt64(4))),
            cancellationToken,
            ("$tree", treeId));

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
               current_version, total_seconds, step_count, unscheduled_count, updated_at
        FROM trees
        """;

    private static TreeRecord ReadTree(DbDataReader r) => new(
        r.GetString(0), r.GetString(1), r.GetString(2), r.GetInt32(3), r.GetString(4), r.GetString(5), r.GetString(6),
        r.IsDBNull(7) ? null : r.GetInt32(7),
        r.IsDBNull(8) ? null : r.GetDouble(8),
        r.IsDBNull(9) ? null : r.GetInt32(9),
        r.IsDBNull(10) ? null : r.GetInt32(10),
        FromMicros(r.GetInt64(11)));

    private static async Task<JobRecord?> ReadJobAsync(SqliteConnection connection, SqliteTransaction? transaction, string jobId, CancellationToken ct)
    {
        var rows = await QueryAsync(connection, transaction, """
            SELECT job_id, tree_id, kind, scan_id, status, attempt, lease_owner, lease_until, payload_json, error, schedule_version, created_at, finished_at
            FROM jobs WHERE job_id = $job
            """,
            r => new JobRecord(
                r.GetString(0), r.GetString(1), r.GetString(2), r.GetString(3), r.GetString(4), r.GetInt32(5),
                r.IsDBNull(6) ? null : r.GetString(6),
                r.IsDBNull(7) ? null : FromMicros(r.GetInt64(7)),
                r.IsDBNull(8) ? null : r.GetString(8),
                r.IsDBNull(9) ? null : r.GetString(9),
                r.IsDBNull(10) ? null : r.GetInt32(10),
                FromMicros(r.GetInt64(11)),
                r.IsDBNull(12) ? null : FromMicros(r.GetInt64(12))),
            ct,
            ("$job", jobId)).ConfigureAwait(false);
        return rows.Count == 0 ? null : rows[0];
    }

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
    /// Runs <paramref name="body"/> in one write transaction that first stores the idempotency record (if any).
    /// When a record under the same (scope, key) exists, the primary key refuses the insert: the transaction is
    /// rolled back and the stored record returned. The body returns false to roll back (a refused request).
    /// </summary>
    private async Task<IdempotencyRecord?> WriteIdempotentAsync(
        IdempotencyRecord? idempotency,
        Func<SqliteConnection, SqliteTransaction, long, CancellationToken, Task<bool>> body,
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
                            VALUES ($scope, $key, $hash, $status, $response, $location, $now)
                            """, cancellationToken, ("$scope", idempotency.Scope), ("$key", idempotency.Key), ("$hash", idempotency.RequestHashHex),
                            ("$status", idempotency.StatusCode), ("$response", idempotency.ResponseJson), ("$location", idempotency.Location), ("$now", now)).ConfigureAwait(false);
                    }
                    catch (SqliteException e) when (e.SqliteErrorCode == SqliteConstraint)
                    {
                        duplicate = true;
                    }
                }

                if (!duplicate)
                {
                    if (await body(connection, transaction, now, cancellationToken).ConfigureAwait(false))
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
