using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// A rigid transform X_AB: the pose of frame B in frame A, mapping points from B to A as
/// p_A = R · p_B + T. Compose as X_AC = X_AB * X_BC.
/// </summary>
public readonly record struct Pose3(Rot3 Rotation, Vec3 Translation)
{
    public static Pose3 Identity => new(Rot3.Identity, Vec3.Zero);

    public Pose3 Inverse()
    {
        var rt = Rotation.Transposed;
        return new Pose3(rt, -(rt * Translation));
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Vec3 TransformPoint(in Vec3 p) => (Rotation * p) + Translation;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Vec3 TransformVector(in Vec3 v) => Rotation * v;

    public static Pose3 operator *(in Pose3 ab, in Pose3 bc) =>
        new(ab.Rotation * bc.Rotation, (ab.Rotation * bc.Translation) + ab.Translation);
}
