using System.Collections.Concurrent;
using System.Globalization;

namespace Orchard.Service.Auth;

/// <summary>
/// Limits failed authentication per client address (unknown, revoked or expired API keys, failed
/// sign-ins): past <see cref="PerMinute"/> failures in a minute, the address is blocked until the minute
/// is over. While blocked, a request presenting a key that is not known to have been usable within the last
/// hour, and every sign-in, gets 429 with Retry-After before any look-up, so keys cannot be guessed at
/// speed; keys the address was already using keep working. Behind a proxy the address is the proxy's.
/// </summary>
public sealed class FailedAuthLimiter(int perMinute, TimeProvider clock)
{
    /// <summary>Beyond this many addresses the table starts afresh.</summary>
    public const int MaxAddresses = 100_000;

    private static readonly TimeSpan Window = TimeSpan.FromMinutes(1);

    private readonly ConcurrentDictionary<string, (DateTimeOffset Start, int Count)> windows = new(StringComparer.Ordinal);

    public int PerMinute { get; } = Math.Max(1, perMinute);

    public void Failed(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (windows.Count >= MaxAddresses)
        {
            windows.Clear();
        }

        var now = clock.GetUtcNow();
        windows.AddOrUpdate(Address(context), _ => (now, 1), (_, w) => now - w.Start >= Window ? (now, 1) : (w.Start, w.Count + 1));
    }

    /// <summary>How long this address stays blocked; null when it is not.</summary>
    public TimeSpan? BlockedFor(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        if (!windows.TryGetValue(Address(context), out var w))
        {
            return null;
        }

        var left = w.Start + Window - clock.GetUtcNow();
        return w.Count >= PerMinute && left > TimeSpan.Zero ? left : null;
    }

    public static string RetryAfter(TimeSpan wait) => Math.Max(1, (int)Math.Ceiling(wait.TotalSeconds)).ToString(CultureInfo.InvariantCulture);

    private static string Address(HttpContext context) => context.Connection.RemoteIpAddress?.ToString() ?? "unknown";
}
