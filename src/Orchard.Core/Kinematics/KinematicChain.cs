using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Orchard.Core.Geometry;
using Orchard.Core.Model;

namespace Orchard.Core.Kinematics;

/// <summary>
/// The serial chain of an <see cref="ArmProfile"/>, prepared once for fast forward kinematics and
/// Jacobians. Immutable and thread-safe; every method writes only into caller-provided spans.
/// <para>
/// URDF convention (see <see cref="Joint"/>): the frame of joint i is the previous link frame ·
/// Trans(OriginM) · Rot(OriginRpyRad); the link frame i is that joint frame moved by the joint value,
/// a rotation about the unit axis (revolute, radians) or a translation along it (prismatic, metres).
/// The tool (TCP) frame is the last link frame · Trans(TcpOffsetM) · Rot(TcpRpyRad).
/// </para>
/// <para>
/// The chain's root frame is the arm's base frame, or, when a base pose is given, the frame that pose
/// is expressed in (typically the tree frame, see <see cref="BasePoseInTree"/>). All outputs are in
/// the root frame.
/// </para>
/// </summary>
public sealed class KinematicChain
{
    /// <summary>Largest joint count accepted, so per-call scratch space can live on the stack.</summary>
    public const int MaxJoints = 32;

    private readonly Pose3 _baseInRoot;
    private readonly Pose3 _toolInLastLink;
    private readonly ChainJoint[] _joints;
    private readonly JointKind[] _kinds;
    private readonly double[] _lower;
    private readonly double[] _maxVelocity;
    private readonly double[] _maxAcceleration;
    private readonly double[] _upper;

    /// <summary>A chain whose root frame is the arm's base frame.</summary>
    public KinematicChain(ArmProfile profile)
        : this(profile, Pose3.Identity)
    {
    }

    /// <summary>A chain whose root frame is the frame <paramref name="baseInRoot"/> is given in (e.g. the tree frame).</summary>
    /// <exception cref="ArgumentException">The profile has no joints, too many, a zero or non-finite axis, or a bad limit.</exception>
    public KinematicChain(ArmProfile profile, in Pose3 baseInRoot)
    {
        ArgumentNullException.ThrowIfNull(profile);
        var joints = profile.Joints;
        var n = joints.Count;
        if (n == 0 || n > MaxJoints)
        {
            throw new ArgumentException($"A chain needs 1 to {MaxJoints} joints; '{profile.Id}' has {n}.", nameof(profile));
        }

        _baseInRoot = baseInRoot;
        _joints = new ChainJoint[n];
        _kinds = new JointKind[n];
        _lower = new double[n];
        _upper = new double[n];
        _maxVelocity = new double[n];
        _maxAcceleration = new double[n];
        for (var i = 0; i < n; i++)
        {
            var joint = joints[i];
            var axis = new Vec3(joint.Axis.X, joint.Axis.Y, joint.Axis.Z);
            if (!axis.IsFinite || axis.Length < 1e-12)
            {
                throw new ArgumentException($"Joint '{joint.Name}' has a zero or non-finite axis.", nameof(profile));
            }

            if (!double.IsFinite(joint.LowerLimit) || !double.IsFinite(joint.UpperLimit) || joint.LowerLimit > joint.UpperLimit)
            {
                throw new ArgumentException($"Joint '{joint.Name}' has limits [{joint.LowerLimit}, {joint.UpperLimit}].", nameof(profile));
            }

            _joints[i] = new ChainJoint(ToPose(joint.OriginM, joint.OriginRpyRad), axis.Normalized(), joint.Kind);
            _kinds[i] = joint.Kind;
            _lower[i] = joint.LowerLimit;
            _upper[i] = joint.UpperLimit;
            _maxVelocity[i] = joint.MaxVelocity;
            _maxAcceleration[i] = joint.MaxAcceleration;
        }

        _toolInLastLink = ToPose(profile.Tool.TcpOffsetM, profile.Tool.TcpRpyRad);
    }

    private KinematicChain(KinematicChain other, in Pose3 baseInRoot)
    {
        _baseInRoot = baseInRoot;
        _toolInLastLink = other._toolInLastLink;
        _joints = other._joints;
        _kinds = other._kinds;
        _lower = other._lower;
        _upper = other._upper;
        _maxVelocity = other._maxVelocity;
        _maxAcceleration = other._maxAcceleration;
    }

    /// <summary>The same chain standing somewhere else (the joint data is shared, not copied).</summary>
    public KinematicChain WithBase(in Pose3 baseInRoot) => new(this, baseInRoot);

    public int JointCount => _kinds.Length;

    /// <summary>The arm's base frame in the chain's root frame.</summary>
    public Pose3 BaseInRoot => _baseInRoot;

    /// <summary>The tool (TCP) frame in the last link's frame.</summary>
    public Pose3 ToolInLastLink => _toolInLastLink;

    public ReadOnlySpan<JointKind> JointKinds => _kinds;

    /// <summary>Lower joint limits, joint units (rad or m).</summary>
    public ReadOnlySpan<double> LowerLimits => _lower;

    /// <summary>Each joint's speed limit, joint units per second.</summary>
    public ReadOnlySpan<double> MaxVelocities => _maxVelocity;

    /// <summary>Each joint's acceleration limit, joint units per second².</summary>
    public ReadOnlySpan<double> MaxAccelerations => _maxAcceleration;

    /// <summary>Upper joint limits, joint units (rad or m).</summary>
    public ReadOnlySpan<double> UpperLimits => _upper;

    /// <summary>The pose of an <see cref="ArmBasePose"/> (position and yaw about z) in the tree frame.</summary>
    public static Pose3 BasePoseInTree(ArmBasePose basePose)
    {
        ArgumentNullException.ThrowIfNull(basePose);
        return new Pose3(
            Rot3.AxisAngle(Vec3.UnitZ, basePose.YawRad),
            new Vec3(basePose.PositionM.X, basePose.PositionM.Y, basePose.PositionM.Z));
    }

    /// <summary>Writes the frame after each joint (link frame i, i = 0..n−1) in the root frame.</summary>
    /// <param name="q">One value per joint, joint units.</param>
    /// <param name="linkFrames">At least <see cref="JointCount"/> entries.</param>
    public void ForwardKinematics(ReadOnlySpan<double> q, Span<Pose3> linkFrames)
    {
        CheckConfiguration(q);
        if (linkFrames.Length < JointCount)
        {
            throw new ArgumentException($"Need room for {JointCount} link frames.", nameof(linkFrames));
        }

        Evaluate(q, linkFrames, default);
    }

    /// <summary>The TCP pose in the root frame.</summary>
    public Pose3 ToolPose(ReadOnlySpan<double> q)
    {
        CheckConfiguration(q);
        return Evaluate(q, default, default);
    }

    /// <summary>
    /// The geometric Jacobian of the TCP in the root frame, 6 × n, row-major (entry [r, c] at
    /// <c>r * n + c</c>): rows 0–2 map joint rates to the TCP's linear velocity, rows 3–5 to its angular
    /// velocity. A prismatic column is [axis; 0], a revolute one [axis × (p_tcp − p_joint); axis].
    /// </summary>
    /// <param name="jacobian6xN">At least 6 · <see cref="JointCount"/> entries.</param>
    public void Jacobian(ReadOnlySpan<double> q, Span<double> jacobian6xN) => ToolPoseAndJacobian(q, jacobian6xN);

    /// <summary>The TCP pose and the Jacobian (as in <see cref="Jacobian"/>) from one pass down the chain.</summary>
    public Pose3 ToolPoseAndJacobian(ReadOnlySpan<double> q, Span<double> jacobian6xN)
    {
        CheckConfiguration(q);
        if (jacobian6xN.Length < 6 * JointCount)
        {
            throw new ArgumentException($"Need room for 6 × {JointCount} Jacobian entries.", nameof(jacobian6xN));
        }

        return Evaluate(q, default, jacobian6xN);
    }

    /// <summary>True when every value is finite and within its joint's limits (inclusive).</summary>
    public bool WithinLimits(ReadOnlySpan<double> q)
    {
        if (q.Length != JointCount)
        {
            return false;
        }

        for (var i = 0; i < q.Length; i++)
        {
            // Written so that NaN fails.
            if (!(q[i] >= _lower[i] && q[i] <= _upper[i]))
            {
                return false;
            }
        }

        return true;
    }

    /// <summary>Clamps each value into its joint's limits, in place.</summary>
    public void ClampToLimits(Span<double> q)
    {
        CheckConfiguration(q);
        for (var i = 0; i < q.Length; i++)
        {
            q[i] = Math.Clamp(q[i], _lower[i], _upper[i]);
        }
    }

    /// <summary>
    /// One pass down the chain. Writes link frames when <paramref name="linkFrames"/> is non-empty and
    /// the Jacobian when <paramref name="jacobian"/> is non-empty; returns the TCP pose. Sizes are checked by callers.
    /// </summary>
    internal Pose3 Evaluate(ReadOnlySpan<double> q, Span<Pose3> linkFrames, Span<double> jacobian)
    {
        var joints = _joints;
        var n = joints.Length;
        var wantJacobian = !jacobian.IsEmpty;
        var wantFrames = !linkFrames.IsEmpty;
        Span<Vec3> axesInRoot = stackalloc Vec3[wantJacobian ? n : 0];
        Span<Vec3> jointPositions = stackalloc Vec3[wantJacobian ? n : 0];

        // Every joint's sine and cosine first, four at a time in 256-bit lanes (within an ulp of Math.SinCos, at a
        // fifth of its time); a prismatic joint's pair is computed and unused.
        Span<double> sines = stackalloc double[MaxVectorJoints];
        Span<double> cosines = stackalloc double[MaxVectorJoints];
        if (n <= MaxVectorJoints)
        {
            Span<double> angles = stackalloc double[MaxVectorJoints];
            for (var i = 0; i < n; i++)
            {
                angles[i] = joints[i].AxisSign * q[i];
            }

            for (var i = 0; i < n; i += 4)
            {
                var (sin, cos) = Vector256.SinCos(Vector256.Create((ReadOnlySpan<double>)angles.Slice(i, 4)));
                sin.CopyTo(sines.Slice(i, 4));
                cos.CopyTo(cosines.Slice(i, 4));
            }
        }

        // The running frame as its three axes (the rotation's columns) and origin, all in the root frame, each a
        // 256-bit vector (x, y, z, 0): the same products and sums, in the same order, as with Vec3, so the results
        // are bit for bit those of the scalar form; about a third fewer instructions.
        var start = _baseInRoot.Rotation;
        var x = Lanes(start.ColumnX);
        var y = Lanes(start.ColumnY);
        var z = Lanes(start.ColumnZ);
        var p = Lanes(_baseInRoot.Translation);
        for (var i = 0; i < n; i++)
        {
            ref readonly var joint = ref joints[i];
            var o = joint.Origin.Translation;
            p += (x * o.X) + (y * o.Y) + (z * o.Z);
            if (joint.OriginRotates)
            {
                Rotate(joint.Origin.Rotation, ref x, ref y, ref z);
            }

            var a = joint.Axis;
            if (wantJacobian)
            {
                axesInRoot[i] = Vector((x * a.X) + (y * a.Y) + (z * a.Z));
                jointPositions[i] = Vector(p);
            }

            if (joint.Kind == JointKind.Prismatic)
            {
                p += ((x * a.X) + (y * a.Y) + (z * a.Z)) * q[i];
            }
            else
            {
                // R · Rot(axis, θ). About a coordinate axis only two columns turn: for Rot_z, x' = c·x + s·y and
                // y' = c·y − s·x (likewise cyclically for Rot_x on y, z and Rot_y on z, x).
                var (sin, cos) = n <= MaxVectorJoints ? (sines[i], cosines[i]) : Math.SinCos(joint.AxisSign * q[i]);
                switch (joint.AxisIndex)
                {
                    case 0:
                        (y, z) = ((y * cos) + (z * sin), (z * cos) - (y * sin));
                        break;
                    case 1:
                        (z, x) = ((z * cos) + (x * sin), (x * cos) - (z * sin));
                        break;
                    case 2:
                        (x, y) = ((x * cos) + (y * sin), (y * cos) - (x * sin));
                        break;
                    default:
                        Rotate(Rot3.AxisAngle(a, q[i]), ref x, ref y, ref z);
                        break;
                }
            }

            if (wantFrames)
            {
                linkFrames[i] = new Pose3(new Rot3(x[0], y[0], z[0], x[1], y[1], z[1], x[2], y[2], z[2]), Vector(p));
            }
        }

        var tool = _toolInLastLink;
        var tcp = Vector(p + (x * tool.Translation.X) + (y * tool.Translation.Y) + (z * tool.Translation.Z));
        Rotate(tool.Rotation, ref x, ref y, ref z);
        if (wantJacobian)
        {
            for (var i = 0; i < n; i++)
            {
                var axis = axesInRoot[i];
                Vec3 linear;
                Vec3 angular;
                if (joints[i].Kind == JointKind.Revolute)
                {
                    linear = Vec3.Cross(axis, tcp - jointPositions[i]);
                    angular = axis;
                }
                else
                {
                    linear = axis;
                    angular = Vec3.Zero;
                }

                jacobian[i] = linear.X;
                jacobian[n + i] = linear.Y;
                jacobian[(2 * n) + i] = linear.Z;
                jacobian[(3 * n) + i] = angular.X;
                jacobian[(4 * n) + i] = angular.Y;
                jacobian[(5 * n) + i] = angular.Z;
            }
        }

        return new Pose3(Rot3.FromColumns(Vector(x), Vector(y), Vector(z)), tcp);
    }

    /// <summary>Chains up to this many joints take their sines and cosines from the vector form.</summary>
    private const int MaxVectorJoints = 8;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> Lanes(in Vec3 v) => Vector256.Create(v.X, v.Y, v.Z, 0.0);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vec3 Vector(Vector256<double> v) => new(v[0], v[1], v[2]);

    /// <summary>Replaces the frame axes (x, y, z) = R by R · <paramref name="m"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Rotate(in Rot3 m, ref Vector256<double> x, ref Vector256<double> y, ref Vector256<double> z)
    {
        var nx = (x * m.M00) + (y * m.M10) + (z * m.M20);
        var ny = (x * m.M01) + (y * m.M11) + (z * m.M21);
        var nz = (x * m.M02) + (y * m.M12) + (z * m.M22);
        x = nx;
        y = ny;
        z = nz;
    }

    private void CheckConfiguration(ReadOnlySpan<double> q)
    {
        if (q.Length != JointCount)
        {
            throw new ArgumentException($"Expected {JointCount} joint values, got {q.Length}.", nameof(q));
        }
    }

    private static Pose3 ToPose(Vector3M offset, RotationRpyRad rpy) =>
        new(Rot3.FromRpy(rpy.Roll, rpy.Pitch, rpy.Yaw), new Vec3(offset.X, offset.Y, offset.Z));

    /// <summary>One joint, prepared: fixed origin, unit axis, and whether the axis is a coordinate axis (±x, ±y, ±z).</summary>
    private readonly struct ChainJoint
    {
        public ChainJoint(in Pose3 origin, in Vec3 axis, JointKind kind)
        {
            Origin = origin;
            Axis = axis;
            Kind = kind;
            OriginRotates = origin.Rotation != Rot3.Identity;
            (AxisIndex, AxisSign) = axis switch
            {
                { X: 1 or -1, Y: 0, Z: 0 } => (0, axis.X),
                { X: 0, Y: 1 or -1, Z: 0 } => (1, axis.Y),
                { X: 0, Y: 0, Z: 1 or -1 } => (2, axis.Z),
                _ => (-1, 1.0),
            };
        }

        public Pose3 Origin { get; }

        public bool OriginRotates { get; }

        public Vec3 Axis { get; }

        public JointKind Kind { get; }

        /// <summary>0, 1, 2 when the axis is ±x, ±y, ±z; −1 otherwise.</summary>
        public int AxisIndex { get; }

        /// <summary>+1 or −1 along that coordinate axis.</summary>
        public double AxisSign { get; }
    }
}
