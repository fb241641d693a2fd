namespace Orchard.Core.Model;

/// <summary>
/// A pruning arm: a serial chain of joints from the base frame to the last link, the shear on it,
/// and what the planner needs to time its work. Joint values are in joint units (see <see cref="Joint"/>).
/// </summary>
/// <param name="Id">Stable id, referenced by schedules.</param>
/// <param name="BaseCapsules">Collision capsules of the base (platform column), in the base frame.</param>
/// <param name="ApproachStandOffM">Distance back along the approach from the cut pose to the pre-cut pose.</param>
/// <param name="StowConfiguration">Joint values of the stowed arm, one per joint.</param>
public sealed record ArmProfile(
    string Id,
    string Name,
    IReadOnlyList<Joint> Joints,
    IReadOnlyList<CapsuleSpec> BaseCapsules,
    ShearTool Tool,
    double ApproachStandOffM,
    IReadOnlyList<double> StowConfiguration,
    CutTimeModel CutTime);
