using Orchard.Core.Model;

namespace Orchard.Service.Api;

/// <summary>
/// What a re-plan job needs, stored with it: where the arm is (its joint values, and the stop's base pose
/// where the platform stands), what is done, what to do with the missed cut.
/// </summary>
public sealed record ReplanPayload(IReadOnlyList<double> CurrentConfiguration, IReadOnlyList<string> DoneCutIds, IReadOnlyList<string> DroppedCutIds, string MissedCutId, string Policy, ArmBasePose? ArmBase = null);
