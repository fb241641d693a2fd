using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Validation;

namespace Orchard.Core.Tests.Validation;

public sealed class ArmProfileValidatorTests
{
    private static ArmProfile WithJoint(ArmProfile arm, int index, Func<Joint, Joint> change) =>
        arm with { Joints = SampleScans.Replace(arm.Joints, index, change) };

    private static void AssertError(ArmProfile arm, string path, string code)
    {
        var report = ArmProfileValidator.Validate(arm);
        Assert.False(report.IsValid);
        Assert.Contains(report.Errors, e => e.Path == path && e.Code == code);
    }

    [Fact]
    public void The_demo_arm_is_valid_with_no_problems()
    {
        Assert.Empty(ArmProfileValidator.Validate(DemoArm.Create()).Problems);
    }

    [Fact]
    public void Inverted_joint_limits_are_reported_at_the_lower_limit()
    {
        var arm = WithJoint(DemoArm.Create(), 2, j => j with { LowerLimit = 1.0, UpperLimit = -1.0 });
        var error = Assert.Single(ArmProfileValidator.Validate(arm).Errors);
        Assert.Equal(("$.joints[2].lowerLimit", "joint.limitsInverted"), (error.Path, error.Code));
    }

    [Fact]
    public void Equal_joint_limits_are_inverted_too()
    {
        AssertError(WithJoint(DemoArm.Create(), 1, j => j with { LowerLimit = 0.5, UpperLimit = 0.5 }), "$.joints[1].lowerLimit", "joint.limitsInverted");
    }

    [Fact]
    public void A_non_finite_velocity_is_reported()
    {
        AssertError(WithJoint(DemoArm.Create(), 3, j => j with { MaxVelocity = double.PositiveInfinity }), "$.joints[3].maxVelocity", "number.notFinite");
    }

    [Fact]
    public void A_zero_acceleration_is_reported()
    {
        AssertError(WithJoint(DemoArm.Create(), 4, j => j with { MaxAcceleration = 0 }), "$.joints[4].maxAcceleration", "joint.accelerationNotPositive");
    }

    [Fact]
    public void A_zero_axis_is_reported()
    {
        AssertError(WithJoint(DemoArm.Create(), 0, j => j with { Axis = Vector3M.Zero }), "$.joints[0].axis", "axis.zero");
    }

    [Fact]
    public void A_duplicate_joint_name_is_reported()
    {
        AssertError(WithJoint(DemoArm.Create(), 5, j => j with { Name = "elbow" }), "$.joints[5].name", "id.duplicate");
    }

    [Fact]
    public void A_capsule_radius_that_is_not_positive_is_reported()
    {
        var arm = WithJoint(DemoArm.Create(), 2, j => j with { LinkCapsules = [j.LinkCapsules[0] with { RadiusM = -0.01 }] });
        AssertError(arm, "$.joints[2].linkCapsules[0].radiusM", "radius.notPositive");
    }

    [Fact]
    public void A_stow_configuration_of_the_wrong_length_is_reported()
    {
        AssertError(DemoArm.Create() with { StowConfiguration = [0.0, 0.0] }, "$.stowConfiguration", "stow.length");
    }

    [Fact]
    public void A_stow_value_outside_its_joint_limits_is_reported()
    {
        var arm = DemoArm.Create();
        var stow = arm.StowConfiguration.ToArray();
        stow[0] = -0.5; // The lift cannot go below its bottom stop.
        AssertError(arm with { StowConfiguration = stow }, "$.stowConfiguration[0]", "stow.outsideLimits");
    }

    [Fact]
    public void Tool_and_approach_figures_must_be_positive()
    {
        var arm = DemoArm.Create();
        var report = ArmProfileValidator.Validate(arm with { Tool = arm.Tool with { MaxCutDiameterMm = 0, ShearCapsules = [] }, ApproachStandOffM = -0.1 });
        var paths = report.Errors.Select(e => e.Path).Order(StringComparer.Ordinal).ToList();
        Assert.Equal(["$.approachStandOffM", "$.tool.maxCutDiameterMm", "$.tool.shearCapsules"], paths);
    }

    [Fact]
    public void A_missing_tool_and_cut_time_are_reported()
    {
        var report = ArmProfileValidator.Validate(DemoArm.Create() with { Tool = null!, CutTime = null! });
        Assert.Equal(["$.cutTime", "$.tool"], report.Errors.Select(e => e.Path).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void A_negative_cut_time_coefficient_is_reported()
    {
        AssertError(DemoArm.Create() with { CutTime = new CutTimeModel(0.5, -0.01, 0) }, "$.cutTime.secondsPerMm", "cutTime.outOfRange");
    }

    [Fact]
    public void A_very_fast_revolute_joint_is_a_warning()
    {
        var report = ArmProfileValidator.Validate(WithJoint(DemoArm.Create(), 6, j => j with { MaxVelocity = 10 }));
        Assert.True(report.IsValid);
        Assert.Contains(report.Warnings, w => w.Path == "$.joints[6].maxVelocity" && w.Code == "joint.velocityUnusual");
    }

    [Fact]
    public void An_arm_with_no_joints_is_reported()
    {
        AssertError(DemoArm.Create() with { Joints = [] }, "$.joints", "joints.count");
    }
}
