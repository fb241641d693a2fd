using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// A rotation matrix, row-major: M{row}{column}. Columns are the rotated frame's axes expressed in the
/// parent frame, so <c>R * v</c> maps a vector from the child frame to the parent frame.
/// </summary>
public readonly record struct Rot3(
    double M00, double M01, double M02,
    double M10, double M11, double M12,
    double M20, double M21, double M22)
{
    public static Rot3 Identity => new(1, 0, 0, 0, 1, 0, 0, 0, 1);

    public Vec3 ColumnX => new(M00, M10, M20);

    public Vec3 ColumnY => new(M01, M11, M21);

    public Vec3 ColumnZ => new(M02, M12, M22);

    public Rot3 Transposed => new(M00, M10, M20, M01, M11, M21, M02, M12, M22);

    /// <summary>A rotation from its columns (the child frame's axes in the parent frame).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Rot3 FromColumns(in Vec3 x, in Vec3 y, in Vec3 z) =>
        new(x.X, y.X, z.X, x.Y, y.Y, z.Y, x.Z, y.Z, z.Z);

    /// <summary>Rotation by <paramref name="angleRad"/> about the unit <paramref name="axis"/> (Rodrigues' formula).</summary>
    public static Rot3 AxisAngle(in Vec3 axis, double angleRad)
    {
        var (s, c) = Math.SinCos(angleRad);
        var t = 1 - c;
        var (x, y, z) = (axis.X, axis.Y, axis.Z);
        return new(
            (t * x * x) + c, (t * x * y) - (s * z), (t * x * z) + (s * y),
            (t * x * y) + (s * z), (t * y * y) + c, (t * y * z) - (s * x),
            (t * x * z) - (s * y), (t * y * z) + (s * x), (t * z * z) + c);
    }

    /// <summary>URDF roll-pitch-yaw: R = Rz(yaw) · Ry(pitch) · Rx(roll).</summary>
    public static Rot3 FromRpy(double rollRad, double pitchRad, double yawRad)
    {
        var (sr, cr) = Math.SinCos(rollRad);
        var (sp, cp) = Math.SinCos(pitchRad);
        var (sy, cy) = Math.SinCos(yawRad);
        return new(
            cy * cp, (cy * sp * sr) - (sy * cr), (cy * sp * cr) + (sy * sr),
            sy * cp, (sy * sp * sr) + (cy * cr), (sy * sp * cr) - (cy * sr),
            -sp, cp * sr, cp * cr);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vec3 operator *(in Rot3 r, in Vec3 v) => new(
        (r.M00 * v.X) + (r.M01 * v.Y) + (r.M02 * v.Z),
        (r.M10 * v.X) + (r.M11 * v.Y) + (r.M12 * v.Z),
        (r.M20 * v.X) + (r.M21 * v.Y) + (r.M22 * v.Z));

    public static Rot3 operator *(in Rot3 a, in Rot3 b) => new(
        (a.M00 * b.M00) + (a.M01 * b.M10) + (a.M02 * b.M20), (a.M00 * b.M01) + (a.M01 * b.M11) + (a.M02 * b.M21), (a.M00 * b.M02) + (a.M01 * b.M12) + (a.M02 * b.M22),
        (a.M10 * b.M00) + (a.M11 * b.M10) + (a.M12 * b.M20), (a.M10 * b.M01) + (a.M11 * b.M11) + (a.M12 * b.M21), (a.M10 * b.M02) + (a.M11 * b.M12) + (a.M12 * b.M22),
        (a.M20 * b.M00) + (a.M21 * b.M10) + (a.M22 * b.M20), (a.M20 * b.M01) + (a.M21 * b.M11) + (a.M22 * b.M21), (a.M20 * b.M02) + (a.M21 * b.M12) + (a.M22 * b.M22));

    /// <summary>
    /// The rotation vector (axis × angle, radians) of this rotation; used for orientation errors.
    /// Stable near 0 and near π.
    /// </summary>
    public Vec3 ToRotationVector()
    {
        var cosAngle = Math.Clamp((M00 + M11 + M22 - 1) * 0.5, -1.0, 1.0);
        var angle = Math.Acos(cosAngle);
        var skew = new Vec3(M21 - M12, M02 - M20, M10 - M01);
        if (angle < 1e-6)
        {
            // sin θ ≈ θ: the skew part is 2θ·axis.
            return skew * 0.5;
        }

        if (Math.PI - angle > 1e-4)
        {
            return skew * (angle / (2 * Math.Sin(angle)));
        }

        // Near π the skew part vanishes; read the axis from the symmetric part R + Rᵀ = 2 a aᵀ (1 − cos θ) + 2 cos θ I.
        var xx = Math.Sqrt(Math.Max(0, (M00 - cosAngle) / (1 - cosAngle)));
        var yy = Math.Sqrt(Math.Max(0, (M11 - cosAngle) / (1 - cosAngle)));
        var zz = Math.Sqrt(Math.Max(0, (M22 - cosAngle) / (1 - cosAngle)));
        Vec3 axis;
        if (xx >= yy && xx >= zz)
        {
            axis = new Vec3(xx, (M01 + M10) / (2 * xx * (1 - cosAngle)), (M02 + M20) / (2 * xx * (1 - cosAngle)));
        }
        else if (yy >= zz)
        {
            axis = new Vec3((M01 + M10) / (2 * yy * (1 - cosAngle)), yy, (M12 + M21) / (2 * yy * (1 - cosAngle)));
        }
        else
        {
            axis = new Vec3((M02 + M20) / (2 * zz * (1 - cosAngle)), (M12 + M21) / (2 * zz * (1 - cosAngle)), zz);
        }

        // Pick the sign that agrees with the (small) skew part.
        if (Vec3.Dot(axis, skew) < 0)
        {
            axis = -axis;
        }

        return axis.Normalized() * angle;
    }
}
