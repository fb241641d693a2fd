namespace Orchard.Core.Model;

/// <summary>
/// A rotation as roll, pitch, yaw in radians, applied as in URDF: R = Rz(yaw) · Ry(pitch) · Rx(roll)
/// (fixed axes x, then y, then z).
/// </summary>
public sealed record RotationRpyRad(double Roll, double Pitch, double Yaw)
{
    public static RotationRpyRad Identity { get; } = new(0, 0, 0);
}
