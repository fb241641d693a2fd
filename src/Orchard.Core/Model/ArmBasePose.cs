namespace Orchard.Core.Model;

/// <summary>
/// Where the arm's base frame stands in the tree frame: a position and a heading about the vertical.
/// The platform stands on level ground, so roll and pitch are taken as zero.
/// </summary>
public sealed record ArmBasePose(Vector3M PositionM, double YawRad);
