namespace Orchard.Core.Model;

/// <summary>
/// One joint of the arm's serial chain and the link it moves, in the URDF convention: the joint frame
/// sits at <see cref="OriginM"/> / <see cref="OriginRpyRad"/> in the previous link's frame, and the
/// joint turns (revolute) or slides (prismatic) about <see cref="Axis"/>, given in its own frame.
/// Joint values, limits, velocities and accelerations are in joint units, as in URDF: radians
/// (rad, rad/s, rad/s²) for a revolute joint, metres (m, m/s, m/s²) for a prismatic one.
/// </summary>
/// <param name="LinkCapsules">Collision capsules of the link this joint moves, in the joint frame.</param>
public sealed record Joint(
    string Name,
    JointKind Kind,
    Vector3M OriginM,
    RotationRpyRad OriginRpyRad,
    Vector3M Axis,
    double LowerLimit,
    double UpperLimit,
    double MaxVelocity,
    double MaxAcceleration,
    IReadOnlyList<CapsuleSpec> LinkCapsules);
