using System.Collections.Concurrent;
using Orchard.Store;

namespace Orchard.Service.Auth;

/// <summary>
/// Keeps keys the store has confirmed for a short while, so a controller polling its schedule costs one
/// database read a request instead of two. Only known keys are kept (an unknown key is looked up every
/// time, so a key made on another replica works at once); each entry lives <see cref="TimeToLive"/>, so a
/// key removed from the store stops working within that time on every replica.
/// </summary>
public sealed class ApiKeyCache(IOrchardStore store, TimeProvider clock)
{
    public static readonly TimeSpan TimeToLive = TimeSpan.FromSeconds(30);

    /// <summary>Beyond this many entries the cache starts afresh; a deployment has tens of keys, not thousands.</summary>
    public const int MaxEntries = 10_000;

    private readonly ConcurrentDictionary<string, (ApiKeyRecord Key, long ExpiresAt)> entries = new(StringComparer.Ordinal);

    public async Task<ApiKeyRecord?> FindAsync(string secretHashHex, CancellationToken cancellationToken)
    {
        var now = clock.GetTimestamp();
        if (entries.TryGetValue(secretHashHex, out var entry) && now < entry.ExpiresAt)
        {
            return entry.Key;
        }

        var key = await store.FindApiKeyAsync(secretHashHex, cancellationToken);
        if (key is null)
        {
            entries.TryRemove(secretHashHex, out _);
            return null;
        }

        if (entries.Count >= MaxEntries)
        {
            entries.Clear();
        }

        entries[secretHashHex] = (key, now + (long)(TimeToLive.TotalSeconds * clock.TimestampFrequency));
        return key;
    }
}
