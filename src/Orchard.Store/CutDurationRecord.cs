namespace Orchard.Store;

/// <summary>
/// A cut's measured duration as the controller reported it with the outcome: the seconds the shear took to
/// close through the wood and open again, with the wood's diameter from the scan. One per (tree, version, cut).
/// <see cref="ReportedAt"/> is the store's time when it was stored (what a caller passes is not kept).
/// </summary>
public sealed record CutDurationRecord(string TreeId, string Block, int Version, string CutId, double DiameterMm, double DurationSeconds, DateTimeOffset ReportedAt);
