using Orchard.Core.Geometry;
using Orchard.Core.Model;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// The arm's geometry recomputed from the <see cref="ArmProfile"/> alone, without the project's kinematics or
/// collision model: forward kinematics by naive composition of the URDF definition,
/// X_tree,link_i = X_tree,base · Π_j≤i Trans(origin_j) · Rot(rpy_j) · Motion_j(q_j), with Rot(rpy) = Rz(yaw)·Ry(pitch)·Rx(roll)
/// built from elementary rotations written out here, a revolute motion by Rodrigues' formula written out here and a
/// prismatic motion as a translation along the unit axis; the tool frame is the last link's · Trans(tcp) · Rot(tcpRpy).
/// Capsules are listed as the profile lists them (each joint's link capsules in joint order, then the shear's), which
/// is the order <see cref="Orchard.Core.Collision.ArmCollisionModel.LocalCapsules"/> documents; the tests check that.
/// </summary>
internal sealed class BruteForceArm
{
    private readonly Joint[] _joints;
    private readonly Vec3[] _unitAxes;
    private readonly Pose3 _basePose;
    private readonly Pose3 _toolInLastLink;
    private readonly Capsule[] _local;
    private readonly int[] _linkOfCapsule;

    public BruteForceArm(ArmProfile profile, ArmBasePose basePose)
    {
        _joints = profile.Joints.ToArray();
        _unitAxes = _joints.Select(j => Unit(ToVec(j.Axis))).ToArray();
        _basePose = new Pose3(RotZ(basePose.YawRad), ToVec(basePose.PositionM));
        _toolInLastLink = Trans(ToVec(profile.Tool.TcpOffsetM)) * Pose3FromRotation(Rpy(profile.Tool.TcpRpyRad));
        var local = new List<Capsule>();
        var links = new List<int>();
        for (var j = 0; j < _joints.Length; j++)
        {
            foreach (var c in _joints[j].LinkCapsules)
            {
                local.Add(ToCapsule(c));
                links.Add(j);
            }
        }

        FirstToolCapsule = local.Count;
        foreach (var c in profile.Tool.ShearCapsules)
        {
            local.Add(ToCapsule(c));
            links.Add(_joints.Length);
        }

        _local = local.ToArray();
        _linkOfCapsule = links.ToArray();
        BaseCapsulesInTree = profile.BaseCapsules.Select(c => Apply(_basePose, ToCapsule(c))).ToArray();
    }

    public int JointCount => _joints.Length;

    /// <summary>The tool's link number: one past the last joint's.</summary>
    public int ToolLink => _joints.Length;

    public IReadOnlyList<Capsule> LocalCapsules => _local;

    public IReadOnlyList<int> LinkOfCapsule => _linkOfCapsule;

    public int FirstToolCapsule { get; }

    public IReadOnlyList<Capsule> BaseCapsulesInTree { get; }

    public double Lower(int joint) => _joints[joint].LowerLimit;

    public double Upper(int joint) => _joints[joint].UpperLimit;

    /// <summary>Every value within its joint's limits, inclusive (NaN fails).</summary>
    public bool WithinLimits(ReadOnlySpan<double> q)
    {
        if (q.Length != _joints.Length)
        {
            return false;
        }

        for (var j = 0; j < q.Length; j++)
        {
            if (!(q[j] >= _joints[j].LowerLimit && q[j] <= _joints[j].UpperLimit))
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>Link frames 0..n−1 and, at index n, the tool (TCP) frame, all in the tree frame.</summary>
    public void Frames(ReadOnlySpan<double> q, Span<Pose3> frames)
    {
        var x = _basePose;
        for (var j = 0; j < _joints.Length; j++)
        {
            var joint = _joints[j];
            var motion = joint.Kind == JointKind.Revolute
                ? Pose3FromRotation(Rodrigues(_unitAxes[j], q[j]))
                : Trans(_unitAxes[j] * q[j]);
            x = x * Trans(ToVec(joint.OriginM)) * Pose3FromRotation(Rpy(joint.OriginRpyRad)) * motion;
            frames[j] = x;
        }

        frames[_joints.Length] = x * _toolInLastLink;
    }

    public Pose3 ToolPose(ReadOnlySpan<double> q)
    {
        Span<Pose3> frames = stackalloc Pose3[_joints.Length + 1];
        Frames(q, frames);
        return frames[_joints.Length];
    }

    /// <summary>Every moving capsule in the tree frame at q, in <see cref="LocalCapsules"/> order.</summary>
    public void Place(ReadOnlySpan<double> q, Span<Capsule> world)
    {
        Span<Pose3> frames = stackalloc Pose3[_joints.Length + 1];
        Frames(q, frames);
        for (var i = 0; i < _local.Length; i++)
        {
            world[i] = Apply(frames[_linkOfCapsule[i]], _local[i]);
        }
    }

    /// <summary>A point given in link <paramref name="link"/>'s frame (the TCP frame for the tool), in the tree frame at q.</summary>
    public Vec3 PointInTree(ReadOnlySpan<double> q, int link, in Vec3 local)
    {
        Span<Pose3> frames = stackalloc Pose3[_joints.Length + 1];
        Frames(q, frames);
        return Apply(frames[link], local);
    }

    /// <summary>R · p + T, written out.</summary>
    public static Vec3 Apply(in Pose3 pose, in Vec3 p)
    {
        var r = pose.Rotation;
        return new Vec3(
            (r.M00 * p.X) + (r.M01 * p.Y) + (r.M02 * p.Z) + pose.Translation.X,
            (r.M10 * p.X) + (r.M11 * p.Y) + (r.M12 * p.Z) + pose.Translation.Y,
            (r.M20 * p.X) + (r.M21 * p.Y) + (r.M22 * p.Z) + pose.Translation.Z);
    }

    private static Capsule Apply(in Pose3 pose, in Capsule c) => new(Apply(pose, c.A), Apply(pose, c.B), c.RadiusM);

    private static Pose3 Trans(in Vec3 t) => new(Rot3.Identity, t);

    private static Pose3 Pose3FromRotation(in Rot3 r) => new(r, Vec3.Zero);

    private static Rot3 RotX(double a)
    {
        var (s, c) = (Math.Sin(a), Math.Cos(a));
        return new Rot3(1, 0, 0, 0, c, -s, 0, s, c);
    }

    private static Rot3 RotY(double a)
    {
        var (s, c) = (Math.Sin(a), Math.Cos(a));
        return new Rot3(c, 0, s, 0, 1, 0, -s, 0, c);
    }

    private static Rot3 RotZ(double a)
    {
        var (s, c) = (Math.Sin(a), Math.Cos(a));
        return new Rot3(c, -s, 0, s, c, 0, 0, 0, 1);
    }

    /// <summary>URDF rpy: Rz(yaw) · Ry(pitch) · Rx(roll).</summary>
    private static Rot3 Rpy(RotationRpyRad rpy) => RotZ(rpy.Yaw) * RotY(rpy.Pitch) * RotX(rpy.Roll);

    /// <summary>Rodrigues: R = I + sin θ K + (1 − cos θ) K², K the cross-product matrix of the unit axis.</summary>
    private static Rot3 Rodrigues(in Vec3 u, double angle)
    {
        var (s, c) = (Math.Sin(angle), Math.Cos(angle));
        var v = 1 - c;
        return new Rot3(
            1 + (v * ((u.X * u.X) - 1)), (-s * u.Z) + (v * u.X * u.Y), (s * u.Y) + (v * u.X * u.Z),
            (s * u.Z) + (v * u.X * u.Y), 1 + (v * ((u.Y * u.Y) - 1)), (-s * u.X) + (v * u.Y * u.Z),
            (-s * u.Y) + (v * u.X * u.Z), (s * u.X) + (v * u.Y * u.Z), 1 + (v * ((u.Z * u.Z) - 1)));
    }

    private static Vec3 Unit(in Vec3 v)
    {
        var length = Math.Sqrt((v.X * v.X) + (v.Y * v.Y) + (v.Z * v.Z));
        return new Vec3(v.X / length, v.Y / length, v.Z / length);
    }

    private static Vec3 ToVec(Vector3M v) => new(v.X, v.Y, v.Z);

    private static Capsule ToCapsule(CapsuleSpec c) => new(ToVec(c.StartM), ToVec(c.EndM), c.RadiusM);
}
