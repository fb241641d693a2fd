namespace Orchard.Store;

/// <summary>
/// The controller's progress on a tree's latest scan: distinct cuts reported done, missed (at least once)
/// and skipped, and the re-plans written after missed cuts.
/// </summary>
public sealed record OutcomeTally(string TreeId, int CutsDone, int CutsMissed, int CutsSkipped, int Replans);
