using Orchard.Store;

namespace Orchard.Store.Tests;

/// <summary>The contract on the embedded store: a new SQLite file in a temp folder for each test.</summary>
public sealed class SqliteStoreContractTests : StoreContractTests
{
    private readonly string folder = Directory.CreateTempSubdirectory("orchard-sqlite-").FullName;

    protected override Task<IOrchardStore> CreateStoreAsync()
    {
        var path = Path.Combine(folder, $"orchard-{Guid.NewGuid():N}.db");
        return Task.FromResult<IOrchardStore>(new SqliteStore(path, TimeProvider.System));
    }

    protected override Task<IOrchardStore> OpenSameDatabaseAsync() =>
        Task.FromResult<IOrchardStore>(new SqliteStore(((SqliteStore)Store).Path, TimeProvider.System));

    protected override Task<IOrchardStore> OpenSameDatabaseAsync(int maxClaimsPerJob) =>
        Task.FromResult<IOrchardStore>(new SqliteStore(((SqliteStore)Store).Path, TimeProvider.System, maxClaimsPerJob));

    protected override ValueTask DisposeDatabaseAsync()
    {
        Directory.Delete(folder, recursive: true);
        return ValueTask.CompletedTask;
    }

    [Fact]
    public async Task The_file_is_in_wal_mode_and_on_disk()
    {
        var path = ((SqliteStore)Store).Path;
        Assert.True(File.Exists(path));
        Assert.Equal("wal", await ((SqliteStore)Store).JournalModeAsync(Ct));
    }
}
