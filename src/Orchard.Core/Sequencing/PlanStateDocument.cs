using Orchard.Core.Reachability;

namespace Orchard.Core.Sequencing;

/// <summary>A <see cref="TreePlanState"/> as a plain document, for storing between a plan and its re-plans.</summary>
public sealed record PlanStateDocument(
    IReadOnlyList<CutReachability> Reachability,
    IReadOnlyList<PlanStateDocument.StoredMove> Moves,
    IReadOnlyList<PlanStateDocument.StoredKey> BlockedStraight)
{
    public sealed record StoredMove(string From, string To, PlannedMove Move);

    public sealed record StoredKey(string From, string To);

    public static PlanStateDocument From(TreePlanState state)
    {
        ArgumentNullException.ThrowIfNull(state);
        return new PlanStateDocument(
            state.Reachability,
            state.Moves.Snapshot().Select(p => new StoredMove(p.Key.From, p.Key.To, p.Value)).ToArray(),
            state.Moves.BlockedSnapshot().Select(k => new StoredKey(k.From, k.To)).ToArray());
    }

    public TreePlanState ToState()
    {
        var cache = new MoveCache(Moves.Select(m => new KeyValuePair<(string, string), PlannedMove>((m.From, m.To), m.Move)));
        foreach (var key in BlockedStraight)
        {
            cache.MarkStraightBlocked(key.From, key.To);
        }

        return new TreePlanState(Reachability, cache);
    }
}
