using System.Globalization;
using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Reachability;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Gets the arm from a reported configuration (at a cut, at a pre-cut pose, part way through a move) to
/// one clear of the wood, the way it came in: straight back along the tool's approach axis (tool −z),
/// following the line by inverse kinematics in small steps, every configuration and every edge checked.
/// Only the shear may touch the limb it is in contact with, and only on that retreat. When the arm is on
/// one of the cut approaches planned at this stand (at the cut, at the pre-cut pose, or between), the
/// retreat is that approach backwards to its clear pose: the very path checked when it was planned. The retreat stops
/// as soon as the arm has <see cref="ReachabilitySettings.ClearanceTargetM"/> of room from the wood; a configuration
/// that is free with that room already needs none.
/// </summary>
public static class StartRetreat
{
    /// <summary>Reported joint values this far outside a limit are taken as at the limit (rounding in the controller).</summary>
    public const double LimitToleranceRad = 1e-6;

    /// <param name="approaches">The cut approaches planned at this stand, the missed cut's first.</param>
    public static StartAssessment Assess(WorkCell cell, IReadOnlyList<double> reported, ReachabilitySettings settings, IEnumerable<CutCandidate>? approaches = null)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(reported);
        ArgumentNullException.ThrowIfNull(settings);
        var chain = cell.Chain;
        var joints = cell.Profile.Joints;
        if (reported.Count != chain.JointCount)
        {
            return Refuse(StartCondition.OutsideLimits, reported.Select(v => v).ToArray(), double.NaN, null, null, null,
                $"The arm reports {reported.Count} joint values; this arm has {chain.JointCount}.");
        }

        var q = reported.ToArray();
        for (var j = 0; j < q.Length; j++)
        {
            var (low, high) = (chain.LowerLimits[j], chain.UpperLimits[j]);
            if (!double.IsFinite(q[j]) || q[j] < low - LimitToleranceRad || q[j] > high + LimitToleranceRad)
            {
                var unit = joints[j].Kind == Model.JointKind.Prismatic ? "m" : "rad";
                return Refuse(StartCondition.OutsideLimits, q, double.NaN, joints[j].Name, null, null, string.Create(CultureInfo.InvariantCulture,
                    $"Joint '{joints[j].Name}' is reported at {q[j]:G6} {unit}, outside its limits [{low:G6}, {high:G6}] {unit}."));
            }

            q[j] = Math.Clamp(q[j], low, high);
        }

        var checker = cell.CreateChecker();
        var report = checker.Check(q);
        if (OnApproach(q, approaches) is { } onApproach)
        {
            var (candidate, at) = onApproach;
            if (at == 0)
            {
                return new StartAssessment(StartCondition.Clear, [q], [0.0], report.ClearanceM, null, null, null, "The arm is at a clear pose of an approach.");
            }

            // Back along the approach: the configurations from here to its clear pose, the first being exactly the reported one.
            var back = new List<double[]> { q };
            back.AddRange(Enumerable.Range(0, at).Reverse().Select(i => candidate.ApproachPath[i].ToArray()));
            var stationsBack = new List<double> { 0.0 };
            stationsBack.AddRange(Enumerable.Range(0, at).Reverse().Select(i => candidate.ApproachStationsM[at] - candidate.ApproachStationsM[i]));
            return new StartAssessment(StartCondition.Retreated, back, stationsBack, report.ClearanceM, null, null, null, string.Create(CultureInfo.InvariantCulture,
                $"The arm backs out along the approach it came in on, {stationsBack[^1] * 1000:F0} mm to its clear pose."));
        }

        if (report.IsFree && checker.SceneClearanceM(q) >= settings.ClearanceTargetM)
        {
            return new StartAssessment(StartCondition.Clear, [q], [0.0], report.ClearanceM, null, null, null, "The arm is clear where it is.");
        }

        // The limb the shear is in contact with (or nearest to) may be touched by the shear on the way out.
        var contact = ContactDescription.Of(cell, report);
        var ignore = CapsuleBvh.NoGroup;
        if (!report.IsFree && report.ArmLink == cell.Arm.ToolLink && report.SceneCapsule >= 0 && cell.Scene.Kinds[report.SceneCapsule] == SceneCapsuleKind.Wood)
        {
            ignore = cell.Scene.Groups[report.SceneCapsule];
        }

        if (!checker.IsFree(q, ignore))
        {
            var stuck = checker.Check(q, ignore);
            var what = ContactDescription.Of(cell, stuck);
            return Refuse(StartCondition.Trapped, q, report.ClearanceM, null, what.ArmLink, what.Touches, string.Create(CultureInfo.InvariantCulture,
                $"The arm is in contact: the {what.ArmLink ?? "arm"} touches {what.Touches ?? "something"} ({stuck.ClearanceM * 1000:F0} mm). Clear it under supervision, then ask again."));
        }

        var ik = new InverseKinematics(chain, settings.InverseKinematics);
        var start = chain.ToolPose(q);
        var path = new List<double[]> { q };
        var stations = new List<double> { 0.0 };
        var limit = cell.Profile.ApproachStandOffM + settings.MaxRetreatM;
        var step = Math.Max(0.005, settings.RetreatStepM);
        var free = report.IsFree;
        for (var back = step; back <= limit + 1e-9; back += step)
        {
            var next = new double[q.Length];
            var attempt = ik.SolveFromSeed(CutPoses.BackedOff(start, back), path[^1], next);
            if (!attempt.Converged || !chain.WithinLimits(next) || Jumps(path[^1], next, settings.MaxApproachJointStep) || !checker.IsEdgeFree(path[^1], next, ignore))
            {
                break;
            }

            path.Add(next);
            stations.Add(back);
            free = checker.IsFree(next);
            if (free && checker.SceneClearanceM(next) >= settings.ClearanceTargetM)
            {
                break;
            }
        }

        if (!free)
        {
            return Refuse(StartCondition.Trapped, q, report.ClearanceM, null, contact.ArmLink, contact.Touches, string.Create(CultureInfo.InvariantCulture,
                $"No straight retreat along the shear's axis frees the arm: the {contact.ArmLink ?? "arm"} is at {report.ClearanceM * 1000:F0} mm from {contact.Touches ?? "something"}. Clear it under supervision, then ask again."));
        }

        if (path.Count == 1)
        {
            return new StartAssessment(StartCondition.Clear, path, stations, report.ClearanceM, null, contact.ArmLink, contact.Touches, "The arm is free where it is; no straight retreat adds room.");
        }

        return new StartAssessment(StartCondition.Retreated, path, stations, report.ClearanceM, null, contact.ArmLink, contact.Touches, string.Create(CultureInfo.InvariantCulture,
            $"The arm backs out {stations[^1] * 1000:F0} mm along the shear's axis first ({report.ClearanceM * 1000:F0} mm from {contact.Touches ?? "the wood"} where it is)."));
    }

    /// <summary>Tolerance for recognising a reported configuration as one of an approach path's (controller rounding).</summary>
    public const double OnPathToleranceRad = 1e-6;

    /// <summary>The approach whose path holds this configuration, and its index there; null when none does.</summary>
    private static (CutCandidate Candidate, int Index)? OnApproach(double[] q, IEnumerable<CutCandidate>? approaches)
    {
        foreach (var candidate in approaches ?? [])
        {
            for (var i = candidate.ApproachPath.Count - 1; i >= 0; i--)
            {
                var p = candidate.ApproachPath[i];
                var same = true;
                for (var j = 0; j < q.Length && same; j++)
                {
                    same = Math.Abs(p[j] - q[j]) <= OnPathToleranceRad;
                }

                if (same)
                {
                    return (candidate, i);
                }
            }
        }

        return null;
    }

    private static bool Jumps(double[] from, double[] to, double maxStep)
    {
        for (var j = 0; j < from.Length; j++)
        {
            if (Math.Abs(to[j] - from[j]) > maxStep)
            {
                return true;
            }
        }

        return false;
    }

    private static StartAssessment Refuse(StartCondition condition, double[] q, double clearance, string? joint, string? link, string? touches, string message) =>
        new(condition, [q], [0.0], clearance, joint, link, touches, message);
}
