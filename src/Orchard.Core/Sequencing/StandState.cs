using Orchard.Core.Reachability;
using Orchard.Core.Stops;

namespace Orchard.Core.Sequencing;

/// <summary>One stand's part of a <see cref="TreePlanState"/>: the cuts analysed from it, the moves planned there, and the last tour made there (node keys).</summary>
public sealed record StandState(Stand Stand, IReadOnlyList<CutReachability> Reachability, MoveCache Moves, IReadOnlyList<string> Order);
