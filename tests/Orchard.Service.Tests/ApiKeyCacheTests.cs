using System.Reflection;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Tests;

/// <summary>The key cache on the real embedded store: known keys kept for their time to live, unknown keys never kept.</summary>
public sealed class ApiKeyCacheTests : IDisposable
{
    private readonly string folder = Directory.CreateTempSubdirectory("orchard-keycache-").FullName;

    [Fact]
    public async Task Known_keys_are_read_once_per_time_to_live_and_unknown_keys_every_time()
    {
        using var store = new SqliteStore(Path.Combine(folder, "orchard.db"), TimeProvider.System);
        await store.MigrateAsync(CancellationToken.None);
        var key = new ApiKeyRecord("key-1", "controller", ApiKeySecrets.HashHex("ok_secret_for_cache_test"), "cache test", DateTimeOffset.UnixEpoch);
        await store.AddApiKeyAsync(key, null, CancellationToken.None);
        var (counted, lookups) = LookupCounter.Wrap(store);
        var clock = new ManualClock();
        var cache = new ApiKeyCache(counted, clock);

        Assert.Null(await cache.FindAsync(ApiKeySecrets.HashHex("ok_unknown"), CancellationToken.None));
        Assert.Null(await cache.FindAsync(ApiKeySecrets.HashHex("ok_unknown"), CancellationToken.None));
        Assert.Equal(2, lookups());

        Assert.Equal("controller", (await cache.FindAsync(key.SecretHashHex, CancellationToken.None))!.Role);
        clock.Advance(ApiKeyCache.TimeToLive - TimeSpan.FromSeconds(1));
        Assert.Equal("controller", (await cache.FindAsync(key.SecretHashHex, CancellationToken.None))!.Role);
        Assert.Equal(3, lookups());

        clock.Advance(TimeSpan.FromSeconds(2));
        Assert.Equal("controller", (await cache.FindAsync(key.SecretHashHex, CancellationToken.None))!.Role);
        Assert.Equal(4, lookups());
    }

    public void Dispose()
    {
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        Directory.Delete(folder, recursive: true);
    }

    private sealed class ManualClock : TimeProvider
    {
        private long ticks = 1_000_000;

        public override long GetTimestamp() => ticks;

        public void Advance(TimeSpan by) => ticks += (long)(by.TotalSeconds * TimestampFrequency);
    }

    /// <summary>Forwards every call to the real store and counts the key look-ups.</summary>
    public class LookupCounter : DispatchProxy
    {
        private IOrchardStore inner = null!;
        private int count;

        public static (IOrchardStore Store, Func<int> Lookups) Wrap(IOrchardStore inner)
        {
            var proxy = Create<IOrchardStore, LookupCounter>();
            var counter = (LookupCounter)(object)proxy;
            counter.inner = inner;
            return (proxy, () => counter.count);
        }

        protected override object? Invoke(MethodInfo? targetMethod, object?[]? args)
        {
            if (targetMethod!.Name == nameof(IOrchardStore.FindApiKeyAsync))
            {
                count++;
            }

            return targetMethod.Invoke(inner, args);
        }
    }
}
