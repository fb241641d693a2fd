using System.Collections.Concurrent;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Every move planned for a tree (against its full scene), keyed by the two ends' node keys, so a
/// re-plan reuses them. Thread-safe. Node keys: <c>stow</c>, <c>c{cut}/{candidate}</c> (pre-cut
/// configurations) and <c>at:{hash}</c> (a configuration the arm reported).
/// </summary>
public sealed class MoveCache
{
    private readonly ConcurrentDictionary<(string From, string To), PlannedMove> _moves = new();
    private readonly ConcurrentDictionary<(string From, string To), bool> _blockedStraight = new();

    public MoveCache()
    {
    }

    public MoveCache(IEnumerable<KeyValuePair<(string From, string To), PlannedMove>> moves)
    {
        ArgumentNullException.ThrowIfNull(moves);
        foreach (var (key, move) in moves)
        {
            _moves[key] = move;
        }
    }

    public int Count => _moves.Count;

    /// <summary>Moves whose straight line was found blocked (not yet planned around).</summary>
    public int BlockedCount => _blockedStraight.Count;

    public void MarkStraightBlocked(string from, string to) => _blockedStraight[(from, to)] = true;

    public bool IsStraightBlocked(string from, string to) => _blockedStraight.ContainsKey((from, to));

    /// <summary>The blocked straight lines, in key order (for storing).</summary>
    public IReadOnlyList<(string From, string To)> BlockedSnapshot() =>
        _blockedStraight.Keys.OrderBy(k => k.From, StringComparer.Ordinal).ThenBy(k => k.To, StringComparer.Ordinal).ToArray();

    public bool TryGet(string from, string to, out PlannedMove move) => _moves.TryGetValue((from, to), out move!);

    public void Add(string from, string to, PlannedMove move) => _moves[(from, to)] = move;

    /// <summary>A copy of the entries, in key order (for storing).</summary>
    public IReadOnlyList<KeyValuePair<(string From, string To), PlannedMove>> Snapshot() =>
        _moves.OrderBy(p => p.Key.From, StringComparer.Ordinal).ThenBy(p => p.Key.To, StringComparer.Ordinal).ToArray();
}
