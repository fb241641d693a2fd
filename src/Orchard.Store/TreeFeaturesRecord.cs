using Orchard.Core.Estimates;

namespace Orchard.Store;

/// <summary>
/// A tree's stored features: of its scan (<see cref="ScanId"/>, written when the scan is accepted) and of its
/// current schedule (<see cref="ScheduleVersion"/>, written when the plan completes). Either part is null
/// until written; a part whose scan id or version is not the tree's latest is stale.
/// </summary>
public sealed record TreeFeaturesRecord(string TreeId, string? ScanId, ScanFeatures? Scan, int? ScheduleVersion, ScheduleFeatures? Schedule);
