using Npgsql;
using Orchard.Store;

namespace Orchard.Store.Tests;

[CollectionDefinition(Name)]
public sealed class PostgresGroup : ICollectionFixture<PostgresServer>
{
    public const string Name = "postgres";
}

/// <summary>The contract on PostgreSQL: a new database for each test.</summary>
[Collection(PostgresGroup.Name)]
public sealed class PostgresStoreContractTests(PostgresServer server) : StoreContractTests
{
    private readonly List<string> databases = [];
    private string current = "";

    protected override async Task<IOrchardStore> CreateStoreAsync()
    {
        current = await server.CreateDatabaseAsync();
        databases.Add(current);
        return new PostgresStore(current);
    }

    protected override Task<IOrchardStore> OpenSameDatabaseAsync() => Task.FromResult<IOrchardStore>(new PostgresStore(databases[0]));

    protected override Task<IOrchardStore> OpenSameDatabaseAsync(int maxClaimsPerJob) => Task.FromResult<IOrchardStore>(new PostgresStore(databases[0], maxClaimsPerJob));

    protected override async ValueTask DisposeDatabaseAsync()
    {
        foreach (var database in databases)
        {
            await server.DropDatabaseAsync(database);
        }
    }

    [Fact]
    public async Task Migrations_run_concurrently_from_several_processes_apply_each_script_once()
    {
        var connectionString = await server.CreateDatabaseAsync();
        databases.Add(connectionString);
        var stores = Enumerable.Range(0, 5).Select(_ => new PostgresStore(connectionString)).ToList();
        try
        {
            await Task.WhenAll(stores.Select(s => Task.Run(() => s.MigrateAsync(Ct), Ct)));
            Assert.All((await stores[0].CountRowsAsync(Ct)).Values, c => Assert.Equal(0, c));
            await using var connection = new NpgsqlConnection(connectionString);
            await connection.OpenAsync(Ct);
            await using var command = new NpgsqlCommand("SELECT count(*), count(DISTINCT scriptname) FROM schema_versions", connection);
            await using var reader = await command.ExecuteReaderAsync(Ct);
            Assert.True(await reader.ReadAsync(Ct));
            Assert.Equal(reader.GetInt64(1), reader.GetInt64(0));
            Assert.True(reader.GetInt64(0) >= 1);
        }
        finally
        {
            foreach (var store in stores)
            {
                await store.DisposeAsync();
            }
        }
    }

    [Fact]
    public async Task Leases_are_on_database_time()
    {
        await Store.AcceptScanAsync(new ScanSubmission("s1", "j1", "T1", "K", "R1", 1, "arm-1", "{}", Orchard.Core.Sequencing.RetryPolicy.RetryLast), null, Ct);
        var job = await Store.ClaimJobAsync("w1", TimeSpan.FromMinutes(10), Ct);
        await using var connection = new NpgsqlConnection(databases[0]);
        await connection.OpenAsync(Ct);
        await using var command = new NpgsqlCommand("SELECT lease_until - created_at FROM jobs WHERE job_id = 'j1'", connection);
        var span = (TimeSpan)(await command.ExecuteScalarAsync(Ct))!;
        Assert.InRange(span, TimeSpan.FromMinutes(10), TimeSpan.FromMinutes(11));
        Assert.Equal(job!.LeaseUntil, job.LeaseUntil!.Value.ToUniversalTime());
    }
}
