using System.Collections.Concurrent;
using Orchard.Store;

namespace Orchard.Service.Auth;

/// <summary>
/// Keeps keys the store has confirmed for a short while, so a controller polling its schedule costs one
/// database read a request instead of two. Only keys the store knows are kept (an unknown key is looked up
/// every time, so a key made on another replica works at once); each entry lives <see cref="TimeToLive"/>,
/// so a key revoked on another replica stops working within that time everywhere (at once on the replica
/// that revoked it, which drops it here). Expiry is checked on every request against the kept record.
/// Hashes that were a usable key within the last hour are remembered apart, so a client address that is
/// blocked for failed sign-ins can still use a key it held (see the failed-authentication limit).
/// </summary>
public sealed class ApiKeyCache(IOrchardStore store, TimeProvider clock)
{
    public static readonly TimeSpan TimeToLive = TimeSpan.FromSeconds(30);

    /// <summary>How long a hash that was a usable key is remembered as such.</summary>
    public static readonly TimeSpan RememberUsable = TimeSpan.FromHours(1);

    /// <summary>Beyond this many entries the cache starts afresh; a deployment has tens of keys, not thousands.</summary>
    public const int MaxEntries = 10_000;

    private readonly ConcurrentDictionary<string, (ApiKeyRecord Key, long ExpiresAt)> entries = new(StringComparer.Ordinal);
    private readonly ConcurrentDictionary<string, long> usable = new(StringComparer.Ordinal);

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

        entries[secretHashHex] = (key, now + Ticks(TimeToLive));
        return key;
    }

    /// <summary>Notes that this hash was a usable key just now.</summary>
    public void MarkUsable(string secretHashHex)
    {
        if (usable.Count >= MaxEntries)
        {
            usable.Clear();
        }

        usable[secretHashHex] = clock.GetTimestamp() + Ticks(RememberUsable);
    }

    /// <summary>Was this hash a usable key within <see cref="RememberUsable"/>?</summary>
    public bool WasRecentlyUsable(string secretHashHex) => usable.TryGetValue(secretHashHex, out var until) && clock.GetTimestamp() < until;

    /// <summary>Forgets a key here at once (it was revoked through this replica).</summary>
    public void Forget(string keyId)
    {
        foreach (var (hash, entry) in entries)
        {
            if (entry.Key.KeyId == keyId)
            {
                entries.TryRemove(hash, out _);
                usable.TryRemove(hash, out _);
            }
        }
    }

    private long Ticks(TimeSpan span) => (long)(span.TotalSeconds * clock.TimestampFrequency);
}
