using System.Collections.Concurrent;
using Orchard.Store;

namespace Orchard.Service.Auth;

/// <summary>
/// Records when each key was last used, at most once a minute per key and replica, so the key listing
/// says when a key was last seen (to within a minute) without a database write on every request.
/// </summary>
public sealed class KeyUseRecorder(IOrchardStore store, TimeProvider clock)
{
    public static readonly TimeSpan Resolution = TimeSpan.FromMinutes(1);

    private readonly ConcurrentDictionary<string, DateTimeOffset> written = new(StringComparer.Ordinal);

    public async Task UsedAsync(string keyId, CancellationToken cancellationToken)
    {
        var now = clock.GetUtcNow();
        if (written.TryGetValue(keyId, out var last) && now - last < Resolution)
        {
            return;
        }

        written[keyId] = now;
        try
        {
            await store.TouchApiKeyAsync(keyId, now, cancellationToken);
        }
        catch (Exception ex) when (StoreFaults.IsTransient(ex))
        {
            // Last use is a convenience; the next request writes it again.
            written.TryRemove(keyId, out _);
        }
    }
}
