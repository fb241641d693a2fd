using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Where a tree's work stands when the arm asks for a new schedule: the configuration it is in now,
/// the cuts already made, the cuts left for a person, and the missed cut with what to do about it.
/// </summary>
/// <param name="ArmBase">Where the platform stands now (the stop of the missed cut); null for the schedule's first stop.</param>
public sealed record ReplanRequest(
    IReadOnlyList<double> CurrentConfiguration,
    IReadOnlyCollection<string> DoneCutIds,
    IReadOnlyCollection<string> DroppedCutIds,
    string? MissedCutId,
    RetryPolicy Policy,
    ArmBasePose? ArmBase = null);
