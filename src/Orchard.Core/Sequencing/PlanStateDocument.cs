using Orchard.Core.Reachability;
using Orchard.Core.Stops;

namespace Orchard.Core.Sequencing;

/// <summary>A <see cref="TreePlanState"/> as a plain document, for storing between a plan and its re-plans.</summary>
public sealed record PlanStateDocument(IReadOnlyList<PlanStateDocument.StoredStand> Stands)
{
    public sealed record StoredStand(
        Stand Stand,
        IReadOnlyList<CutReachability> Reachability,
        IReadOnlyList<StoredMove> Moves,
        IReadOnlyList<StoredKey> BlockedStraight,
        IReadOnlyList<string>? Order = null);

    public sealed record StoredMove(string From, string To, PlannedMove Move);

    public sealed record StoredKey(string From, string To);

    public static PlanStateDocument From(TreePlanState state)
    {
        ArgumentNullException.ThrowIfNull(state);
        return new PlanStateDocument(state.Stands.Select(s => new StoredStand(
            s.Stand,
            s.Reachability,
            s.Moves.Snapshot().Select(p => new StoredMove(p.Key.From, p.Key.To, p.Value)).ToArray(),
            s.Moves.BlockedSnapshot().Select(k => new StoredKey(k.From, k.To)).ToArray(),
            s.Order)).ToArray());
    }

    public TreePlanState ToState() => new(Stands.Select(s =>
    {
        var cache = new MoveCache(s.Moves.Select(m => new KeyValuePair<(string, string), PlannedMove>((m.From, m.To), m.Move)));
        foreach (var key in s.BlockedStraight)
        {
            cache.MarkStraightBlocked(key.From, key.To);
        }

        return new StandState(s.Stand, s.Reachability, cache, s.Order ?? []);
    }).ToArray());
}
