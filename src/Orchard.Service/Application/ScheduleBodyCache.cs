using System.Collections.Concurrent;
using System.Text;

namespace Orchard.Service.Application;

/// <summary>
/// The UTF-8 bodies of recently served schedules, by tree and version. A schedule version never changes
/// once written, so an entry can never be stale: a request reads only the tree's current version from the
/// store and sends the body from here when it has it. This spares reading, decoding and re-encoding a
/// 50-100 kB document on every poll of a controller. Bounded by <see cref="MaxBytes"/>; when full it
/// starts afresh (the hot set is the trees being pruned right now, refilled in one request each).
/// </summary>
public sealed class ScheduleBodyCache
{
    public const long MaxBytes = 32L * 1024 * 1024;

    private readonly ConcurrentDictionary<string, (int Version, byte[] Body)> entries = new(StringComparer.Ordinal);
    private long totalBytes;

    public byte[]? Find(string treeId, int version) =>
        entries.TryGetValue(treeId, out var entry) && entry.Version == version ? entry.Body : null;

    public byte[] Keep(string treeId, int version, string json)
    {
        ArgumentNullException.ThrowIfNull(json);
        var body = Encoding.UTF8.GetBytes(json);
        if (Interlocked.Add(ref totalBytes, body.Length) > MaxBytes)
        {
            entries.Clear();
            Interlocked.Exchange(ref totalBytes, body.Length);
        }

        entries.AddOrUpdate(treeId, (version, body), (_, old) => old.Version > version ? old : (version, body));
        return body;
    }
}
