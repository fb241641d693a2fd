namespace Orchard.Core.Model;

/// <summary>A cut left out of a schedule and why: unreachable (with the reason), moot (another cut removes its wood), done or dropped.</summary>
/// <param name="Status"><c>unreachable</c>, <c>moot</c>, <c>done</c> or <c>dropped</c>.</param>
/// <param name="Reason">For unreachable cuts: <c>aboveShearRating</c>, <c>outOfReach</c>, <c>jointLimits</c>, <c>collision</c>; for moot cuts: <c>removedByCut</c>.</param>
/// <param name="RemovedBy">For moot cuts, the cut that removes this one's wood.</param>
public sealed record UnscheduledCut(string CutId, string Status, string? Reason, string Detail, string? RemovedBy = null);
