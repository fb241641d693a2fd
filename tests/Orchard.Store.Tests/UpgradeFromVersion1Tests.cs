using System.Data.Common;
using DbUp;
using DbUp.Builder;
using Microsoft.Data.Sqlite;
using Npgsql;
using Orchard.Core.Estimates;
using Orchard.Core.Sequencing;
using Orchard.Store;

namespace Orchard.Store.Tests;

/// <summary>
/// A database made by version 1 of the schema, holding a tree with two scans, a plan, a re-plan, its plan
/// state, outcomes and a queued job, is upgraded by the store's migrations: nothing is lost, every schedule
/// and outcome names its scan, the plan state is keyed by scan, and the queue carries on. A database made by
/// version 2 (integrity and keys), holding plans, outcomes and a re-plan, gains version 3 (row registry,
/// tree features, cut durations) with its progress intact. (A fresh database: the store contract's
/// migration test.)
/// </summary>
public abstract class UpgradeFromVersion1Tests
{
    protected static CancellationToken Ct => CancellationToken.None;

    /// <summary>A new database with migration 0001 only; returns the store on it (not migrated further) and a connection maker.</summary>
    protected abstract Task<(IOrchardStore Store, Func<DbConnection> Connect, Func<DateTimeOffset, object> Time)> CreateVersion1Async();

    /// <summary>A new database with migrations 0001 and 0002 only; the store on it, not migrated further.</summary>
    protected abstract Task<IOrchardStore> CreateVersion2Async();

    [Fact]
    public async Task A_version_2_database_with_plans_and_outcomes_upgrades_to_version_3_with_its_progress()
    {
        var store = await CreateVersion2Async();
        try
        {
            // Written through the store on the version 2 schema: nothing below touches a table of version 3.
            await store.AddApiKeyAsync(new ApiKeyRecord("k1", "admin", "h1", "admin", DateTimeOffset.UtcNow), null, Ct);
            Assert.True((await store.AcceptScanAsync(new ScanSubmission("s1", "j1", "T1", "K", "R1", 1, "arm-1", "{}", RetryPolicy.RetryLast), null, Ct)).Accepted);
            var plan = (await store.ClaimJobAsync("w1", TimeSpan.FromMinutes(5), Ct))!;
            Assert.Equal(CompletionStatus.Written, (await store.CompleteJobAsync(plan.JobId, plan.Attempt, "w1", new ScheduleWrite("""{"version":0}""", "{}", 10, 3, 0), Ct)).Status);
            Assert.True((await store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c1", CutOutcome.Done), null, Ct)).Accepted);
            var missed = await store.RecordOutcomeAsync(new OutcomeSubmission("T1", 1, "c2", CutOutcome.Missed) { ReplanJobId = "jr", ReplanPayload = "{}" }, null, Ct);
            Assert.Equal("jr", missed.ReplanJobId);
            var replan = (await store.ClaimJobAsync("w1", TimeSpan.FromMinutes(5), Ct))!;
            Assert.Equal(new CompletionResult(CompletionStatus.Written, 2, null), await store.CompleteJobAsync(replan.JobId, replan.Attempt, "w1", new ScheduleWrite("""{"version":0}""", "{}", 8, 2, 0), Ct));

            await store.MigrateAsync(Ct);

            Assert.Equal(StoreTables.All.Order(StringComparer.Ordinal), (await store.CountRowsAsync(Ct)).Keys.Order(StringComparer.Ordinal));
            Assert.Equal([new OutcomeTally("T1", 1, 1, 0, 1)], await store.ListOutcomeTalliesAsync(Ct));
            var tree = (await store.GetTreeAsync("T1", Ct))!;
            Assert.Equal((2, "s1", true), (tree.CurrentVersion, tree.CurrentScanId, tree.IsPlannedForLatestScan));
            Assert.Empty(await store.ListTreeFeaturesAsync(Ct));
            Assert.True(await store.PutScanFeaturesAsync("T1", "s1", new ScanFeatures(3, 4.5, 9), Ct));
            Assert.True(await store.PutScheduleFeaturesAsync("T1", 2, new ScheduleFeatures(8, 2, 0, 0, 1, 0, 3, 40, 800), Ct));
            Assert.Equal(2, Assert.Single(await store.ListTreeFeaturesAsync(Ct)).ScheduleVersion);
            Assert.True(await store.AddCutDurationAsync(new CutDurationRecord("T1", "K", 2, "c3", 20, 1.5, DateTimeOffset.UnixEpoch), Ct));
            await store.PutOrchardDocumentAsync("rates", """{"handSecondsPerCut":30}""", "k1", Ct);
            Assert.Equal("""{"handSecondsPerCut":30}""", await store.GetOrchardDocumentAsync("rates", Ct));

            // A second run changes nothing.
            await store.MigrateAsync(Ct);
            Assert.Single(await store.ListCutDurationsAsync(Ct));
            Assert.Equal([new OutcomeTally("T1", 1, 1, 0, 1)], await store.ListOutcomeTalliesAsync(Ct));
        }
        finally
        {
            await DisposeAsync(store);
        }
    }

    private static async Task DisposeAsync(IOrchardStore store)
    {
        switch (store)
        {
            case IAsyncDisposable a:
                await a.DisposeAsync();
                break;
            case IDisposable d:
                d.Dispose();
                break;
        }
    }

    [Fact]
    public async Task A_version_1_database_with_plans_and_outcomes_upgrades_without_losing_anything()
    {
        var (store, connect, time) = await CreateVersion1Async();
        try
        {
            await using (var connection = connect())
            {
                await connection.OpenAsync(Ct);
                var at = time(DateTimeOffset.UtcNow.AddMinutes(-10));
                foreach (var sql in new[]
                {
                    "INSERT INTO api_keys (key_id, role, secret_hash_hex, label, created_at) VALUES ('k1', 'admin', 'h1', 'admin', @at)",
                    "INSERT INTO trees (tree_id, block, row_label, position_in_row, arm_profile_id, latest_scan_id, retry_policy, current_version, total_seconds, step_count, unscheduled_count, updated_at) VALUES ('T1', 'K', 'R1', 1, 'arm-1', 's2', 'retryLast', 2, 10, 3, 1, @at)",
                    "INSERT INTO scans (scan_id, tree_id, scan_json, created_at) VALUES ('s1', 'T1', '{}', @at), ('s2', 'T1', '{}', @at)",
                    "INSERT INTO jobs (job_id, tree_id, kind, scan_id, status, attempt, created_at, schedule_version) VALUES ('j1', 'T1', 'plan', 's1', 'done', 1, @at, 1), ('jr', 'T1', 'replan', 's1', 'done', 1, @at, 2), ('j3', 'T1', 'plan', 's2', 'queued', 0, @at, NULL)",
                    "INSERT INTO schedules (tree_id, version, schedule_json, job_id, created_at) VALUES ('T1', 1, '{\"version\":1}', 'j1', @at), ('T1', 2, '{\"version\":2}', 'jr', @at)",
                    "INSERT INTO plan_state (tree_id, version, state_json, updated_at) VALUES ('T1', 2, '{\"state\":2}', @at)",
                    "INSERT INTO outcomes (tree_id, version, cut_id, outcome, job_id, scan_id, reported_at) VALUES ('T1', 1, 'c1', 'done', NULL, NULL, @at), ('T1', 1, 'c2', 'missed', 'jr', 's1', @at)",
                })
                {
                    await using var command = connection.CreateCommand();
                    command.CommandText = sql;
                    var parameter = command.CreateParameter();
                    parameter.ParameterName = "at";
                    parameter.Value = at;
                    command.Parameters.Add(parameter);
                    await command.ExecuteNonQueryAsync(Ct);
                }
            }

            await store.MigrateAsync(Ct);

            var tree = (await store.GetTreeAsync("T1", Ct))!;
            Assert.Equal((2, "s1", "s2", false), (tree.CurrentVersion, tree.CurrentScanId, tree.LatestScanId, tree.IsPlannedForLatestScan));
            Assert.Equal("s1", (await store.GetScheduleAsync("T1", 1, Ct))!.ScanId);
            Assert.Equal("s1", (await store.GetCurrentScheduleAsync("T1", Ct))!.ScanId);
            Assert.Equal("""{"state":2}""", await store.GetPlanStateAsync("T1", "s1", Ct));
            Assert.Equal([("c1", CutOutcome.Done), ("c2", CutOutcome.Missed)], (await store.ListOutcomesAsync("T1", "s1", Ct)).Select(o => (o.CutId, o.Outcome)));
            Assert.Equal((JobStatus.Done, JobKind.Replan), ((await store.GetJobAsync("jr", Ct))!.Status, (await store.GetJobAsync("jr", Ct))!.Kind));
            var key = (await store.FindApiKeyAsync("h1", Ct))!;
            Assert.Equal((null, null, false), (key.RevokedAt, key.ExpiresAt, key.Demo));

            // The queue carries on: the second scan's job is claimed and becomes version 3.
            var job = (await store.ClaimJobAsync("w1", TimeSpan.FromMinutes(5), Ct))!;
            Assert.Equal("j3", job.JobId);
            Assert.Equal(new CompletionResult(CompletionStatus.Written, 3, null), await store.CompleteJobAsync("j3", job.Attempt, "w1", new ScheduleWrite("""{"version":0}""", "{}", 1, 1, 0), Ct));
            Assert.Equal(("s2", """{"version":3}"""), ((await store.GetCurrentScheduleAsync("T1", Ct))!.ScanId, (await store.GetCurrentScheduleAsync("T1", Ct))!.ScheduleJson));

            // Version 3 is there too: every table, features kept for the newest scan and version, no progress on s2 yet.
            Assert.Equal(StoreTables.All.Order(StringComparer.Ordinal), (await store.CountRowsAsync(Ct)).Keys.Order(StringComparer.Ordinal));
            Assert.True(await store.PutScanFeaturesAsync("T1", "s2", new ScanFeatures(1, 2, 3), Ct));
            Assert.True(await store.PutScheduleFeaturesAsync("T1", 3, new ScheduleFeatures(1, 1, 0, 0, 0, 0, 1, 10, 100), Ct));
            Assert.Empty(await store.ListOutcomeTalliesAsync(Ct));
        }
        finally
        {
            await DisposeAsync(store);
        }
    }

    protected static void ApplyVersion1(UpgradeEngineBuilder builder)
    {
        var result = builder.LogToNowhere().Build().PerformUpgrade();
        Assert.True(result.Successful, result.Error?.Message);
    }
}

public sealed class SqliteUpgradeFromVersion1Tests : UpgradeFromVersion1Tests, IDisposable
{
    private readonly string folder = Directory.CreateTempSubdirectory("orchard-upgrade-").FullName;

    protected override Task<(IOrchardStore Store, Func<DbConnection> Connect, Func<DateTimeOffset, object> Time)> CreateVersion1Async()
    {
        var path = Path.Combine(folder, "orchard.db");
        var connectionString = new SqliteConnectionStringBuilder { DataSource = path, Pooling = false }.ToString();
        ApplyVersion1(DeployChanges.To.SqliteDatabase(connectionString)
            .WithScriptsEmbeddedInAssembly(typeof(SqliteStore).Assembly, n => n.Contains(".Migrations.Sqlite.0001_", StringComparison.Ordinal))
            .JournalToSqliteTable("schema_versions"));
        return Task.FromResult<(IOrchardStore, Func<DbConnection>, Func<DateTimeOffset, object>)>(
            (new SqliteStore(path, TimeProvider.System), () => new SqliteConnection(connectionString), t => (t.UtcTicks - DateTimeOffset.UnixEpoch.UtcTicks) / TimeSpan.TicksPerMicrosecond));
    }

    protected override Task<IOrchardStore> CreateVersion2Async()
    {
        var path = Path.Combine(folder, "orchard-v2.db");
        // As the store migrates: foreign keys off (0002 rebuilds tables others refer to).
        var connectionString = new SqliteConnectionStringBuilder { DataSource = path, Pooling = false, ForeignKeys = false }.ToString();
        ApplyVersion1(DeployChanges.To.SqliteDatabase(connectionString)
            .WithScriptsEmbeddedInAssembly(typeof(SqliteStore).Assembly, n => n.Contains(".Migrations.Sqlite.0001_", StringComparison.Ordinal) || n.Contains(".Migrations.Sqlite.0002_", StringComparison.Ordinal))
            .JournalToSqliteTable("schema_versions"));
        return Task.FromResult<IOrchardStore>(new SqliteStore(path, TimeProvider.System));
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(folder, recursive: true);
    }
}

[Collection(PostgresGroup.Name)]
public sealed class PostgresUpgradeFromVersion1Tests(PostgresServer server) : UpgradeFromVersion1Tests, IAsyncLifetime
{
    private string database = "";

    protected override async Task<(IOrchardStore Store, Func<DbConnection> Connect, Func<DateTimeOffset, object> Time)> CreateVersion1Async()
    {
        database = await server.CreateDatabaseAsync();
        ApplyVersion1(DeployChanges.To.PostgresqlDatabase(database)
            .WithScriptsEmbeddedInAssembly(typeof(PostgresStore).Assembly, n => n.Contains(".Migrations.Postgres.0001_", StringComparison.Ordinal))
            .JournalToPostgresqlTable("public", "schema_versions"));
        return (new PostgresStore(database), () => new NpgsqlConnection(database), t => t);
    }

    protected override async Task<IOrchardStore> CreateVersion2Async()
    {
        database = await server.CreateDatabaseAsync();
        ApplyVersion1(DeployChanges.To.PostgresqlDatabase(database)
            .WithScriptsEmbeddedInAssembly(typeof(PostgresStore).Assembly, n => n.Contains(".Migrations.Postgres.0001_", StringComparison.Ordinal) || n.Contains(".Migrations.Postgres.0002_", StringComparison.Ordinal))
            .JournalToPostgresqlTable("public", "schema_versions"));
        return new PostgresStore(database);
    }

    public Task InitializeAsync() => Task.CompletedTask;

    public async Task DisposeAsync()
    {
        if (database.Length > 0)
        {
            await server.DropDatabaseAsync(database);
        }
    }
}
