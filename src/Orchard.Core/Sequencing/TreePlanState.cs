using Orchard.Core.Reachability;

namespace Orchard.Core.Sequencing;

/// <summary>
/// What planning a tree leaves behind for its re-plans: the cuts' candidates (deterministic, but dear
/// to recompute) and every move planned so far.
/// </summary>
public sealed record TreePlanState(IReadOnlyList<CutReachability> Reachability, MoveCache Moves);
