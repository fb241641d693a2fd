using Orchard.Core.Demo;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Kinematics;

public sealed class KinematicChainJacobianTests
{
    [Fact]
    public void Demo_arm_Jacobian_matches_central_finite_differences_of_forward_kinematics() =>
        CheckAgainstFiniteDifferences(
            new KinematicChain(DemoArm.Create(), KinematicChain.BasePoseInTree(new(new(0.4, 2.5, 0.1), 1.2))),
            new DeterministicRandom(6_2),
            200);

    [Fact]
    public void Oblique_axis_arm_Jacobian_matches_central_finite_differences_of_forward_kinematics()
    {
        // Axes off the coordinate directions, rotated joint origins, a prismatic joint in the middle.
        var profile = DemoArm.Create();
        Vector3M[] axes = [new(0.3, 0.1, 1), new(1, 0.5, -0.2), new(0, -1, 0.4), new(0.2, 0.2, 0.9), new(-1, 0.3, 0), new(0.5, -0.5, 0.7), new(0, 0, -1)];
        profile = profile with
        {
            Joints = [.. profile.Joints.Select((joint, i) => joint with
            {
                Axis = axes[i],
                OriginRpyRad = new RotationRpyRad(0.2 * i, -0.1 * i, 0.3),
                Kind = i == 3 ? JointKind.Prismatic : joint.Kind,
                LowerLimit = -1.5,
                UpperLimit = 1.5,
            })],
        };
        CheckAgainstFiniteDifferences(new KinematicChain(profile), new DeterministicRandom(63), 100);
    }

    private static void CheckAgainstFiniteDifferences(KinematicChain chain, DeterministicRandom random, int configurations)
    {
        // Column i of the geometric Jacobian is d(p_tcp)/dq_i over ω_i, where ω_i is read from the rotation
        // vector of R(q + h e_i) R(q)ᵀ. Central differences: truncation error O(h²) ≈ 1e-12, rounding ≈ 1e-10.
        const double h = 1e-6;
        const double tolerance = 1e-7;
        var n = chain.JointCount;
        var jacobian = new double[6 * n];
        var plus = new double[n];
        var minus = new double[n];
        for (var k = 0; k < configurations; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(random, chain.LowerLimits, chain.UpperLimits, margin: 2 * h);
            var pose = chain.ToolPoseAndJacobian(q, jacobian);
            KinematicsAssert.Near(chain.ToolPose(q), pose, 0, "pose returned with the Jacobian");
            for (var i = 0; i < n; i++)
            {
                q.CopyTo(plus, 0);
                q.CopyTo(minus, 0);
                plus[i] += h;
                minus[i] -= h;
                var up = chain.ToolPose(plus);
                var down = chain.ToolPose(minus);
                var linear = (up.Translation - down.Translation) / (2 * h);
                var angular = ((up.Rotation * pose.Rotation.Transposed).ToRotationVector()
                    - (down.Rotation * pose.Rotation.Transposed).ToRotationVector()) / (2 * h);
                KinematicsAssert.Near(linear, Column(jacobian, n, i, 0), tolerance, $"configuration {k}, joint {i}, linear");
                KinematicsAssert.Near(angular, Column(jacobian, n, i, 3), tolerance, $"configuration {k}, joint {i}, angular");
            }
        }
    }

    [Fact]
    public void Demo_arm_lift_column_is_its_axis_with_no_rotation()
    {
        var chain = new KinematicChain(DemoArm.Create());
        var jacobian = new double[6 * chain.JointCount];
        chain.Jacobian([0.3, 0.4, -0.5, 1.0, 0.2, 0.7, -0.1], jacobian);
        KinematicsAssert.Near(Vec3.UnitZ, Column(jacobian, chain.JointCount, 0, 0), 1e-15, "lift linear");
        KinematicsAssert.Near(Vec3.Zero, Column(jacobian, chain.JointCount, 0, 3), 0, "lift angular");
    }

    [Fact]
    public void Planar_2R_Jacobian_matches_Spong_closed_form()
    {
        // Spong, Hutchinson and Vidyasagar, "Robot Modeling and Control", 1st ed. (2006), Ch. 4, the two-link
        // planar manipulator's Jacobian (example number not recalled; formula recalled from memory):
        // J = [−a₁s₁ − a₂s₁₂, −a₂s₁₂; a₁c₁ + a₂c₁₂, a₂c₁₂; 0, 0; 0, 0; 0, 0; 1, 1].
        const double a1 = 0.7, a2 = 0.4;
        var chain = new KinematicChain(TestArms.Planar2R(a1, a2));
        var random = new DeterministicRandom(4);
        var jacobian = new double[12];
        for (var k = 0; k < 100; k++)
        {
            var q = KinematicsAssert.RandomConfiguration(random, chain.LowerLimits, chain.UpperLimits);
            chain.Jacobian(q, jacobian);
            var (s1, c1) = Math.SinCos(q[0]);
            var (s12, c12) = Math.SinCos(q[0] + q[1]);
            double[] expected =
            [
                (-a1 * s1) - (a2 * s12), -a2 * s12,
                (a1 * c1) + (a2 * c12), a2 * c12,
                0, 0,
                0, 0,
                0, 0,
                1, 1,
            ];
            for (var e = 0; e < 12; e++)
            {
                Assert.True(Math.Abs(expected[e] - jacobian[e]) <= 1e-12, $"configuration {k}, entry {e / 2},{e % 2}: expected {expected[e]}, got {jacobian[e]}.");
            }
        }
    }

    private static Vec3 Column(double[] jacobian, int n, int column, int firstRow) =>
        new(jacobian[(firstRow * n) + column], jacobian[((firstRow + 1) * n) + column], jacobian[((firstRow + 2) * n) + column]);
}
