using Orchard.Core.Demo;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Kinematics;

public sealed class KinematicChainForwardTests
{
    private const double Tolerance = 1e-12;

    /// <summary>
    /// The closed-form forward kinematics ⁰T₆ of the PUMA 560 from Craig, "Introduction to Robotics:
    /// Mechanics and Control", 3rd ed. (2005), §3.7 (the r_ij and p expressions, about eq. 3.13–3.14;
    /// formulas and equation numbers recalled from memory). c23 = cos(θ₂ + θ₃), s23 = sin(θ₂ + θ₃).
    /// </summary>
    private static Pose3 PumaClosedForm(ReadOnlySpan<double> t)
    {
        var (s1, c1) = Math.SinCos(t[0]);
        var (s2, c2) = Math.SinCos(t[1]);
        var (s4, c4) = Math.SinCos(t[3]);
        var (s5, c5) = Math.SinCos(t[4]);
        var (s6, c6) = Math.SinCos(t[5]);
        var (s23, c23) = Math.SinCos(t[1] + t[2]);
        const double a2 = TestArms.PumaA2, a3 = TestArms.PumaA3, d3 = TestArms.PumaD3, d4 = TestArms.PumaD4;

        var r11 = (c1 * ((c23 * ((c4 * c5 * c6) - (s4 * s6))) - (s23 * s5 * c6))) + (s1 * ((s4 * c5 * c6) + (c4 * s6)));
        var r21 = (s1 * ((c23 * ((c4 * c5 * c6) - (s4 * s6))) - (s23 * s5 * c6))) - (c1 * ((s4 * c5 * c6) + (c4 * s6)));
        var r31 = (-s23 * ((c4 * c5 * c6) - (s4 * s6))) - (c23 * s5 * c6);
        var r12 = (c1 * ((c23 * ((-c4 * c5 * s6) - (s4 * c6))) + (s23 * s5 * s6))) + (s1 * ((c4 * c6) - (s4 * c5 * s6)));
        var r22 = (s1 * ((c23 * ((-c4 * c5 * s6) - (s4 * c6))) + (s23 * s5 * s6))) - (c1 * ((c4 * c6) - (s4 * c5 * s6)));
        var r32 = (-s23 * ((-c4 * c5 * s6) - (s4 * c6))) + (c23 * s5 * s6);
        var r13 = (-c1 * ((c23 * c4 * s5) + (s23 * c5))) - (s1 * s4 * s5);
        var r23 = (-s1 * ((c23 * c4 * s5) + (s23 * c5))) + (c1 * s4 * s5);
        var r33 = (s23 * c4 * s5) - (c23 * c5);
        var reach = (a2 * c2) + (a3 * c23) - (d4 * s23);
        var px = (c1 * reach) - (d3 * s1);
        var py = (s1 * reach) + (d3 * c1);
        var pz = (-a3 * s23) - (a2 * s2) - (d4 * c23);
        return new Pose3(new Rot3(r11, r12, r13, r21, r22, r23, r31, r32, r33), new Vec3(px, py, pz));
    }

    /// <summary>
    /// The modified-DH link transform ^{i−1}T_i of Craig, 3rd ed. (2005), §3.5, eq. 3.6 (recalled from memory),
    /// written out entry by entry, independent of the chain code.
    /// </summary>
    private static Pose3 CraigLinkTransform(double alphaPrev, double aPrev, double d, double theta)
    {
        var (st, ct) = Math.SinCos(theta);
        var (sa, ca) = Math.SinCos(alphaPrev);
        return new Pose3(
            new Rot3(
                ct, -st, 0,
                st * ca, ct * ca, -sa,
                st * sa, ct * sa, ca),
            new Vec3(aPrev, -sa * d, ca * d));
    }

    [Fact]
    public void Puma560_tool_pose_matches_Craig_closed_form_at_500_random_configurations()
    {
        var chain = new KinematicChain(TestArms.Puma560());
        var random = new DeterministicRandom(560);
        for (var k = 0; k < 500; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(random, chain.LowerLimits, chain.UpperLimits);
            KinematicsAssert.Near(PumaClosedForm(q), chain.ToolPose(q), Tolerance, $"configuration {k}");
        }
    }

    [Fact]
    public void Puma560_at_zero_has_Craig_home_pose()
    {
        // Craig's closed form at θ = 0 (formulas recalled from memory, see PumaClosedForm): R = diag(1, −1, −1),
        // p = (a₂ + a₃, d₃, −d₄). Worked by hand from those formulas.
        var chain = new KinematicChain(TestArms.Puma560());
        var pose = chain.ToolPose(new double[6]);
        KinematicsAssert.Near(new Rot3(1, 0, 0, 0, -1, 0, 0, 0, -1), pose.Rotation, Tolerance, "home rotation");
        KinematicsAssert.Near(new Vec3(TestArms.PumaA2 + TestArms.PumaA3, TestArms.PumaD3, -TestArms.PumaD4), pose.Translation, Tolerance, "home position");
    }

    [Fact]
    public void Puma560_every_link_frame_matches_the_product_of_Craig_link_transforms()
    {
        var chain = new KinematicChain(TestArms.Puma560());
        var random = new DeterministicRandom(3_6);
        Span<Pose3> frames = stackalloc Pose3[6];
        for (var k = 0; k < 200; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(random, chain.LowerLimits, chain.UpperLimits);
            chain.ForwardKinematics(q, frames);
            var expected = Pose3.Identity;
            for (var i = 0; i < 6; i++)
            {
                var (alpha, a, d) = TestArms.PumaModifiedDh[i];
                expected *= CraigLinkTransform(alpha, a, d, q[i]);
                KinematicsAssert.Near(expected, frames[i], Tolerance, $"configuration {k}, frame {i + 1}");
            }
        }
    }

    [Fact]
    public void Planar_2R_tool_position_matches_Spong_planar_elbow_formula()
    {
        // Spong, Hutchinson and Vidyasagar, "Robot Modeling and Control", 1st ed. (2006), Ch. 3, the two-link
        // planar arm: x = a₁c₁ + a₂c₁₂, y = a₁s₁ + a₂s₁₂, tool x axis along link 2 at angle θ₁ + θ₂
        // (example number not recalled; formula recalled from memory).
        const double a1 = 0.7, a2 = 0.4;
        var chain = new KinematicChain(TestArms.Planar2R(a1, a2));
        var random = new DeterministicRandom(2);
        for (var k = 0; k < 200; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(random, chain.LowerLimits, chain.UpperLimits);
            var pose = chain.ToolPose(q);
            var expected = new Vec3((a1 * Math.Cos(q[0])) + (a2 * Math.Cos(q[0] + q[1])), (a1 * Math.Sin(q[0])) + (a2 * Math.Sin(q[0] + q[1])), 0);
            KinematicsAssert.Near(expected, pose.Translation, Tolerance, $"configuration {k}");
            KinematicsAssert.Near(Rot3.AxisAngle(Vec3.UnitZ, q[0] + q[1]), pose.Rotation, Tolerance, $"configuration {k}");
        }

        // Explicit numbers, worked by hand from the formula: θ = (90°, −90°) puts the tool at (a₂, a₁) pointing along +x.
        var bent = chain.ToolPose([Math.PI / 2, -Math.PI / 2]);
        KinematicsAssert.Near(new Vec3(0.4, 0.7, 0), bent.Translation, Tolerance, "θ = (90°, −90°)");
        KinematicsAssert.Near(Rot3.Identity, bent.Rotation, Tolerance, "θ = (90°, −90°)");
    }

    [Fact]
    public void Demo_arm_at_zero_points_straight_up()
    {
        // DemoArm's documentation: "At zero joint values the arm points straight up". The joint offsets and the
        // TCP offset along z sum to 0.15 + 0.20 + 0.55 + 0.25 + 0.25 + 0.10 + 0.18 = 1.68 m, tool z up.
        var chain = new KinematicChain(DemoArm.Create());
        var pose = chain.ToolPose(new double[chain.JointCount]);
        KinematicsAssert.Near(new Vec3(0, 0, 1.68), pose.Translation, Tolerance, "TCP");
        KinematicsAssert.Near(Rot3.Identity, pose.Rotation, Tolerance, "tool orientation");

        // The lift raises everything by its value.
        var raised = chain.ToolPose([0.5, 0, 0, 0, 0, 0, 0]);
        KinematicsAssert.Near(new Vec3(0, 0, 2.18), raised.Translation, Tolerance, "TCP with the lift at 0.5 m");
    }

    [Fact]
    public void Demo_arm_shoulder_at_90_degrees_lays_the_arm_along_x()
    {
        // Rotating about +y by +90° turns +z into +x. Shoulder pivot at z = 0.15 + 0.20; the rest of the arm
        // (0.55 + 0.25 + 0.25 + 0.10 + 0.18 = 1.33 m) then lies along +x.
        var chain = new KinematicChain(DemoArm.Create());
        var pose = chain.ToolPose([0, 0, Math.PI / 2, 0, 0, 0, 0]);
        KinematicsAssert.Near(new Vec3(1.33, 0, 0.35), pose.Translation, Tolerance, "TCP");
        KinematicsAssert.Near(new Vec3(1, 0, 0), pose.Rotation.ColumnZ, Tolerance, "approach direction");
    }

    [Fact]
    public void Tool_pose_is_last_link_frame_times_TCP_offset_and_base_pose_moves_everything()
    {
        var profile = DemoArm.Create() with
        {
            Tool = DemoArm.Create().Tool with { TcpOffsetM = new Vector3M(0.01, -0.02, 0.18), TcpRpyRad = new RotationRpyRad(0.1, -0.2, 0.3) },
        };
        var armBase = new ArmBasePose(new Vector3M(1.5, -2.0, 0.3), 0.7);
        var inBase = new KinematicChain(profile);
        var inTree = new KinematicChain(profile, KinematicChain.BasePoseInTree(armBase));
        var tcp = new Pose3(Rot3.FromRpy(0.1, -0.2, 0.3), new Vec3(0.01, -0.02, 0.18));
        var basePose = new Pose3(Rot3.AxisAngle(Vec3.UnitZ, 0.7), new Vec3(1.5, -2.0, 0.3));
        var random = new DeterministicRandom(7);
        Span<Pose3> frames = stackalloc Pose3[inBase.JointCount];
        Span<Pose3> treeFrames = stackalloc Pose3[inBase.JointCount];
        for (var k = 0; k < 50; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(random, inBase.LowerLimits, inBase.UpperLimits);
            inBase.ForwardKinematics(q, frames);
            inTree.ForwardKinematics(q, treeFrames);
            KinematicsAssert.Near(frames[^1] * tcp, inBase.ToolPose(q), Tolerance, "tool from last link");
            KinematicsAssert.Near(basePose * inBase.ToolPose(q), inTree.ToolPose(q), Tolerance, "tool in tree frame");
            for (var i = 0; i < frames.Length; i++)
            {
                KinematicsAssert.Near(basePose * frames[i], treeFrames[i], Tolerance, $"link {i} in tree frame");
            }
        }
    }

    [Fact]
    public void Random_arms_with_oblique_and_negative_axes_match_the_URDF_definition_composed_naively()
    {
        // The URDF joint definition (see Joint): X_link = X_previous · Trans(origin) · Rot(rpy) · Motion(q), with
        // Motion a rotation about the unit axis (revolute) or a translation along it (prismatic). Composed here
        // with plain Pose3 products, independently of the chain's column-by-column arithmetic.
        var random = new DeterministicRandom(77);
        Vector3M[] fixedAxes = [new(1, 0, 0), new(0, -1, 0), new(0, 0, -1), new(-1, 0, 0)];
        // Every fifth arm has 11 joints: chains of more than 8 take their sines from Math.SinCos, the others from the
        // four-lane vector form, and both must compose the same transforms.
        for (var arm = 0; arm < 20; arm++)
        {
            var jointCount = arm % 5 == 4 ? 11 : 6;
            var frames = new Pose3[jointCount];
            var joints = new List<Joint>();
            for (var i = 0; i < jointCount; i++)
            {
                var axis = i < fixedAxes.Length && arm % 2 == 0
                    ? fixedAxes[i]
                    : new Vector3M(random.NextDouble(-1, 1), random.NextDouble(-1, 1), random.NextDouble(-1, 1) + 2);
                joints.Add(new Joint(
                    $"j{i}",
                    random.NextBool(0.25) ? JointKind.Prismatic : JointKind.Revolute,
                    new Vector3M(random.NextDouble(-0.3, 0.3), random.NextDouble(-0.3, 0.3), random.NextDouble(-0.3, 0.3)),
                    random.NextBool(0.5) ? RotationRpyRad.Identity : new RotationRpyRad(random.NextDouble(-3, 3), random.NextDouble(-1.5, 1.5), random.NextDouble(-3, 3)),
                    axis,
                    -2,
                    2,
                    1,
                    1,
                    []));
            }

            var profile = DemoArm.Create() with
            {
                Joints = joints,
                Tool = DemoArm.Create().Tool with { TcpOffsetM = new Vector3M(0.02, 0.03, 0.1), TcpRpyRad = new RotationRpyRad(0.3, 0.2, -0.4) },
            };
            var basePose = new Pose3(Rot3.FromRpy(0.1, 0.2, 0.3), new Vec3(1, 2, 3));
            var chain = new KinematicChain(profile, basePose);
            for (var k = 0; k < 20; k++)
            {
                var q = KinematicsAssert.RandomConfiguration(random, chain.LowerLimits, chain.UpperLimits);
                chain.ForwardKinematics(q, frames);
                var expected = basePose;
                for (var i = 0; i < jointCount; i++)
                {
                    var joint = joints[i];
                    var axis = new Vec3(joint.Axis.X, joint.Axis.Y, joint.Axis.Z).Normalized();
                    var motion = joint.Kind == JointKind.Revolute
                        ? new Pose3(Rot3.AxisAngle(axis, q[i]), Vec3.Zero)
                        : new Pose3(Rot3.Identity, axis * q[i]);
                    var origin = new Pose3(
                        Rot3.FromRpy(joint.OriginRpyRad.Roll, joint.OriginRpyRad.Pitch, joint.OriginRpyRad.Yaw),
                        new Vec3(joint.OriginM.X, joint.OriginM.Y, joint.OriginM.Z));
                    expected = expected * origin * motion;
                    KinematicsAssert.Near(expected, frames[i], 1e-12, $"arm {arm}, configuration {k}, link {i}");
                }

                var tool = new Pose3(Rot3.FromRpy(0.3, 0.2, -0.4), new Vec3(0.02, 0.03, 0.1));
                KinematicsAssert.Near(expected * tool, chain.ToolPose(q), 1e-12, $"arm {arm}, configuration {k}, tool");
            }
        }
    }

    [Fact]
    public void Within_limits_accepts_the_box_and_rejects_outside_NaN_and_wrong_length()
    {
        var chain = new KinematicChain(DemoArm.Create());
        var q = new double[chain.JointCount];
        chain.LowerLimits.CopyTo(q);
        Assert.True(chain.WithinLimits(q));
        chain.UpperLimits.CopyTo(q);
        Assert.True(chain.WithinLimits(q));

        q[3] += 1e-9;
        Assert.False(chain.WithinLimits(q));
        chain.ClampToLimits(q);
        Assert.True(chain.WithinLimits(q));
        Assert.Equal(chain.UpperLimits[3], q[3]);

        q[0] = -0.01; // the lift cannot go below 0 m
        Assert.False(chain.WithinLimits(q));
        q[0] = double.NaN;
        Assert.False(chain.WithinLimits(q));
        Assert.False(chain.WithinLimits(new double[chain.JointCount - 1]));
    }

    [Fact]
    public void Chain_rejects_a_zero_axis_and_inverted_limits()
    {
        var profile = DemoArm.Create();
        var zeroAxis = profile with { Joints = [profile.Joints[0] with { Axis = Vector3M.Zero }] };
        var inverted = profile with { Joints = [profile.Joints[1] with { LowerLimit = 1, UpperLimit = -1 }] };
        Assert.Throws<ArgumentException>(() => new KinematicChain(zeroAxis));
        Assert.Throws<ArgumentException>(() => new KinematicChain(inverted));
        Assert.Throws<ArgumentException>(() => new KinematicChain(profile).ToolPose(new double[3]));
    }
}
