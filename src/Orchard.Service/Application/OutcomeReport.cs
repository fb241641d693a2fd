using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>A cut outcome as the arm controller reports it (every member but the configuration is required).</summary>
/// <param name="Version">The schedule version the cut belongs to.</param>
/// <param name="Configuration">The arm's joint values now (needed for <c>missed</c>, to re-plan from here).</param>
/// <param name="DurationSeconds">Optional, for <c>done</c>: the seconds the shear took to close through the wood and open again, as measured; it teaches the block's cut-time model.</param>
public sealed record OutcomeReport(int? Version, string? CutId, CutOutcome? Outcome, IReadOnlyList<double>? Configuration, double? DurationSeconds = null);
