using Orchard.Core.Model;

namespace Orchard.Core.Validation;

/// <summary>
/// Checks an arm profile and reports every problem at once, each with its JSON path. Never throws.
/// Limits: 1–16 joints, 32 capsules per link, offsets within 5 m, capsule radii within 1 m.
/// </summary>
public static class ArmProfileValidator
{
    public const int MaxJoints = 16;
    public const int MaxCapsulesPerLink = 32;
    private const double MaxOffsetM = 5.0;
    private const double MaxCapsuleRadiusM = 1.0;
    private const int MaxIdLength = 64;

    /// <summary>Revolute joints faster than this are unusual for an arm working near trees (common practice): a warning.</summary>
    private const double PlausibleMaxVelocityRadS = 2 * Math.PI;

    public static ValidationReport Validate(ArmProfile? arm)
    {
        var problems = new ProblemCollector();
        if (arm is null)
        {
            problems.Error("$", "document.missing", "An arm profile is required.");
            return problems.ToReport();
        }

        problems.Identifier(arm.Id, MaxIdLength, "$.id");
        if (problems.Present(arm.Name, "$.name") && arm.Name.Length > 200)
        {
            problems.Error("$.name", "name.tooLong", "Must be at most 200 characters.");
        }

        var jointsUsable = CheckJoints(arm.Joints, problems);
        CheckCapsules(arm.BaseCapsules, "$.baseCapsules", problems, allowEmpty: true);
        CheckTool(arm.Tool, problems);
        problems.Positive(arm.ApproachStandOffM, 1.0, "$.approachStandOffM", "standOff.notPositive", "The approach stand-off");
        if (jointsUsable)
        {
            CheckStow(arm.StowConfiguration, arm.Joints, problems);
        }
        else
        {
            problems.Present(arm.StowConfiguration, "$.stowConfiguration");
        }

        if (problems.Present(arm.CutTime, "$.cutTime"))
        {
            problems.InRange(arm.CutTime.BaseSeconds, 0, 60, "$.cutTime.baseSeconds", "cutTime.outOfRange", "The base cut time");
            problems.InRange(arm.CutTime.SecondsPerMm, 0, 10, "$.cutTime.secondsPerMm", "cutTime.outOfRange", "The cut time per millimetre");
            problems.InRange(arm.CutTime.SecondsPerMm2, 0, 1, "$.cutTime.secondsPerMm2", "cutTime.outOfRange", "The cut time per square millimetre");
        }

        return problems.ToReport();
    }

    private static bool CheckJoints(IReadOnlyList<Joint>? joints, ProblemCollector problems)
    {
        if (!problems.Present(joints, "$.joints"))
        {
            return false;
        }

        if (joints!.Count is 0 or > MaxJoints)
        {
            problems.Error("$.joints", "joints.count", $"An arm needs 1 to {MaxJoints} joints; there are {joints.Count}.");
            return false;
        }

        var names = new Dictionary<string, int>(StringComparer.Ordinal);
        var usable = true;
        for (var i = 0; i < joints.Count; i++)
        {
            var path = $"$.joints[{i}]";
            var joint = joints[i];
            if (!problems.Present(joint, path))
            {
                usable = false;
                continue;
            }

            if (problems.Identifier(joint.Name, MaxIdLength, path + ".name") && !names.TryAdd(joint.Name, i))
            {
                problems.Error(path + ".name", "id.duplicate", $"Joint name '{joint.Name}' is already used by $.joints[{names[joint.Name]}].");
            }

            if (!Enum.IsDefined(joint.Kind))
            {
                problems.Error(path + ".kind", "enum.unknown", "Must be one of: revolute, prismatic.");
                usable = false;
            }

            problems.Vector(joint.OriginM, MaxOffsetM, path + ".originM");
            if (problems.Present(joint.OriginRpyRad, path + ".originRpyRad"))
            {
                problems.Finite(joint.OriginRpyRad.Roll, path + ".originRpyRad.roll");
                problems.Finite(joint.OriginRpyRad.Pitch, path + ".originRpyRad.pitch");
                problems.Finite(joint.OriginRpyRad.Yaw, path + ".originRpyRad.yaw");
            }

            if (problems.Vector(joint.Axis, 1e3, path + ".axis"))
            {
                var length = Math.Sqrt((joint.Axis.X * joint.Axis.X) + (joint.Axis.Y * joint.Axis.Y) + (joint.Axis.Z * joint.Axis.Z));
                if (length < 1e-9)
                {
                    problems.Error(path + ".axis", "axis.zero", "The joint axis must not be the zero vector.");
                }
                else if (Math.Abs(length - 1) > 1e-6)
                {
                    problems.Warning(path + ".axis", "axis.notUnit", $"The axis has length {length:G6}; it is used normalised.");
                }
            }

            var lowerOk = problems.Finite(joint.LowerLimit, path + ".lowerLimit");
            var upperOk = problems.Finite(joint.UpperLimit, path + ".upperLimit");
            if (lowerOk && upperOk && joint.LowerLimit >= joint.UpperLimit)
            {
                problems.Error(path + ".lowerLimit", "joint.limitsInverted", $"The lower limit ({joint.LowerLimit:G}) must be below the upper limit ({joint.UpperLimit:G}).");
                usable = false;
            }

            usable &= lowerOk && upperOk;
            if (problems.Positive(joint.MaxVelocity, 1e3, path + ".maxVelocity", "joint.velocityNotPositive", "The maximum velocity")
                && joint.Kind == JointKind.Revolute && joint.MaxVelocity > PlausibleMaxVelocityRadS)
            {
                problems.Warning(path + ".maxVelocity", "joint.velocityUnusual", $"{joint.MaxVelocity:G4} rad/s is faster than arms working near trees usually move (≤ {PlausibleMaxVelocityRadS:G4} rad/s).");
            }

            problems.Positive(joint.MaxAcceleration, 1e4, path + ".maxAcceleration", "joint.accelerationNotPositive", "The maximum acceleration");
            CheckCapsules(joint.LinkCapsules, path + ".linkCapsules", problems, allowEmpty: true);
        }

        return usable;
    }

    private static void CheckCapsules(IReadOnlyList<CapsuleSpec>? capsules, string path, ProblemCollector problems, bool allowEmpty)
    {
        if (!problems.Present(capsules, path))
        {
            return;
        }

        if (capsules!.Count > MaxCapsulesPerLink)
        {
            problems.Error(path, "capsules.tooMany", $"At most {MaxCapsulesPerLink} capsules; there are {capsules.Count}.");
            return;
        }

        if (!allowEmpty && capsules.Count == 0)
        {
            problems.Error(path, "capsules.empty", "At least one capsule is required.");
        }

        for (var i = 0; i < capsules.Count; i++)
        {
            var capsulePath = $"{path}[{i}]";
            var capsule = capsules[i];
            if (!problems.Present(capsule, capsulePath))
            {
                continue;
            }

            problems.Vector(capsule.StartM, MaxOffsetM, capsulePath + ".startM");
            problems.Vector(capsule.EndM, MaxOffsetM, capsulePath + ".endM");
            problems.Positive(capsule.RadiusM, MaxCapsuleRadiusM, capsulePath + ".radiusM", "radius.notPositive", "A capsule radius");
        }
    }

    private static void CheckTool(ShearTool? tool, ProblemCollector problems)
    {
        if (!problems.Present(tool, "$.tool"))
        {
            return;
        }

        problems.Vector(tool!.TcpOffsetM, MaxOffsetM, "$.tool.tcpOffsetM");
        if (problems.Present(tool.TcpRpyRad, "$.tool.tcpRpyRad"))
        {
            problems.Finite(tool.TcpRpyRad.Roll, "$.tool.tcpRpyRad.roll");
            problems.Finite(tool.TcpRpyRad.Pitch, "$.tool.tcpRpyRad.pitch");
            problems.Finite(tool.TcpRpyRad.Yaw, "$.tool.tcpRpyRad.yaw");
        }

        CheckCapsules(tool.ShearCapsules, "$.tool.shearCapsules", problems, allowEmpty: false);
        problems.Positive(tool.MaxCutDiameterMm, 200, "$.tool.maxCutDiameterMm", "diameter.notPositive", "The shear's rated diameter");
    }

    private static void CheckStow(IReadOnlyList<double>? stow, IReadOnlyList<Joint> joints, ProblemCollector problems)
    {
        if (!problems.Present(stow, "$.stowConfiguration"))
        {
            return;
        }

        if (stow!.Count != joints.Count)
        {
            problems.Error("$.stowConfiguration", "stow.length", $"Needs one value per joint ({joints.Count}); it has {stow.Count}.");
            return;
        }

        for (var i = 0; i < stow.Count; i++)
        {
            problems.InRange(stow[i], joints[i].LowerLimit, joints[i].UpperLimit, $"$.stowConfiguration[{i}]", "stow.outsideLimits", $"The stowed value of joint '{joints[i].Name}'");
        }
    }
}
