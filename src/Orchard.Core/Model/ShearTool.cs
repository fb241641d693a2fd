namespace Orchard.Core.Model;

/// <summary>
/// The shear end effector, fixed to the last link. Tool frame at the tool centre point (TCP): z points
/// out of the tool along the approach, the branch lies along y between the open jaws, and the jaws
/// close along x. So at a cut, tool z is perpendicular to the branch and tool y runs along it.
/// </summary>
/// <param name="TcpOffsetM">TCP position in the last link's frame.</param>
/// <param name="TcpRpyRad">TCP orientation in the last link's frame.</param>
/// <param name="ShearCapsules">The tool body and jaws, in the tool (TCP) frame.</param>
/// <param name="MaxCutDiameterMm">Largest branch diameter the shear is rated to cut.</param>
public sealed record ShearTool(
    Vector3M TcpOffsetM,
    RotationRpyRad TcpRpyRad,
    IReadOnlyList<CapsuleSpec> ShearCapsules,
    double MaxCutDiameterMm);
