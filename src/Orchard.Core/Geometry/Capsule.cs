using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// A capsule: every point within <see cref="RadiusM"/> of the segment from <see cref="A"/> to <see cref="B"/> (metres).
/// A = B gives a sphere. The radius is expected to be finite and ≥ 0.
/// </summary>
public readonly record struct Capsule(Vec3 A, Vec3 B, double RadiusM)
{
    /// <summary>Length of the core segment A–B (metres).</summary>
    public double SegmentLengthM => Vec3.Distance(A, B);

    /// <summary>Midpoint of the core segment.</summary>
    public Vec3 Center => (A + B) * 0.5;

    /// <summary>The tight axis-aligned box of the capsule (the segment's box grown by the radius).</summary>
    public Aabb Bounds
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get
        {
            var r = RadiusM;
            var min = Vec3.Min(A, B);
            var max = Vec3.Max(A, B);
            return new Aabb(new Vec3(min.X - r, min.Y - r, min.Z - r), new Vec3(max.X + r, max.Y + r, max.Z + r));
        }
    }

    /// <summary>
    /// This capsule, given in frame B, expressed in frame A through the pose X_AB (rigid, so the radius is unchanged).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Capsule Transformed(in Pose3 pose) => new(pose.TransformPoint(A), pose.TransformPoint(B), RadiusM);

    public bool IsFinite => A.IsFinite && B.IsFinite && double.IsFinite(RadiusM);
}
