using Orchard.Core.Stops;

namespace Orchard.Core.Sequencing;

/// <summary>
/// What planning a tree leaves behind for its re-plans: for each stop of the schedule, the stand, the
/// cuts' reachability from it (deterministic, but dear to recompute) and every move planned there.
/// </summary>
public sealed record TreePlanState(IReadOnlyList<StandState> Stands);
