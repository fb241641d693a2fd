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
/// as soon as the arm has <see cref="ReachabilitySettings.ClearanceTargetM"/> of room from the wood and has backed out
/// at least <see cref="ReachabilitySettings.MinRetreatM"/>: every re-plan starts with a checked retreat, unless not
/// even one straight step back is free (then, when the arm is free, it moves from where it is).
/// </summary>
public static class StartRetreat
{
    /// <summary>Reported joint values this far outside a limit are taken as at the limit (rounding in the controller).</summary>
    public const double LimitToleranceRad = 1e-6;

    /// <param name="approaches">The cut approaches planned at this stand, the missed cut's first.</param>
    public static StartAssessment Assess(WorkCell cell, IReadOnlyList<double> reported, ReachabilitySettings settings, IEnumerable<(CutCandidate Candidate, int LimbGroup)>? approaches = null)
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
        var ik = new InverseKinematics(chain, settings.InverseKinematics);
        var path = new List<double[]> { q };
        var stations = new List<double> { 0.0 };
        var groups = new List<int>();
        string how;
        ContactDescription? contact = null;
        if (OnApproach(q, approaches) is { } onApproach)
        {
            // Back along the approach it came in on, to its clear pose: the path checked when it was planned.
            // Retreat segment k runs approach segment at−1−k backwards: the limb may be touched inside the pre-cut pose only.
            var (candidate, limb, at) = onApproach;
            for (var i = at - 1; i >= 0; i--)
            {
                path.Add(candidate.ApproachPath[i].ToArray());
                stations.Add(candidate.ApproachStationsM[at] - candidate.ApproachStationsM[i]);
                groups.Add(i >= candidate.PreCutIndex ? limb : CapsuleBvh.NoGroup);
            }

            how = "along the approach it came in on";
        }
        else
        {
            // The limb the shear is in contact with (or nearest to) may be touched by the shear on the way out.
            contact = ContactDescription.Of(cell, report);
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

            BackOut(cell, checker, ik, settings, path, stations, groups, ignore);
            how = "along the shear's axis";
        }

        // Every re-plan backs out at least the minimum along the shear's axis, on from wherever the first part ended.
        if (stations[^1] < settings.MinRetreatM - 1e-9)
        {
            BackOut(cell, checker, ik, settings, path, stations, groups, CapsuleBvh.NoGroup);
        }

        var end = path[^1];
        if (!checker.IsFree(end))
        {
            contact ??= ContactDescription.Of(cell, report);
            return Refuse(StartCondition.Trapped, q, report.ClearanceM, null, contact.ArmLink, contact.Touches, string.Create(CultureInfo.InvariantCulture,
                $"No straight retreat along the shear's axis frees the arm: the {contact.ArmLink ?? "arm"} is at {report.ClearanceM * 1000:F0} mm from {contact.Touches ?? "something"}. Clear it under supervision, then ask again."));
        }

        if (path.Count == 1)
        {
            return new StartAssessment(StartCondition.Clear, path, stations, report.ClearanceM, null, contact?.ArmLink, contact?.Touches,
                "The arm is free where it is; no straight retreat along the shear's axis is possible, so it moves from there.", []);
        }

        return new StartAssessment(StartCondition.Retreated, path, stations, report.ClearanceM, null, contact?.ArmLink, contact?.Touches, string.Create(CultureInfo.InvariantCulture,
            $"The arm backs out {stations[^1] * 1000:F0} mm {how} first ({report.ClearanceM * 1000:F0} mm from the nearest thing where it is)."), groups);
    }

    /// <summary>
    /// Extends a retreat straight back along the shear's axis (tool −z) from its last configuration, in IK steps,
    /// each configuration in the limits and each edge free (the tool may touch <paramref name="ignore"/>), until the
    /// arm is free with the clearance target and the retreat is at least the minimum long, or it reaches its longest
    /// or a step fails.
    /// </summary>
    private static void BackOut(WorkCell cell, CollisionChecker checker, InverseKinematics ik, ReachabilitySettings settings, List<double[]> path, List<double> stations, List<int> groups, int ignore)
    {
        var chain = cell.Chain;
        var from = chain.ToolPose(path[^1]);
        var base0 = stations[^1];
        var limit = cell.Profile.ApproachStandOffM + settings.MaxRetreatM;
        var step = Math.Max(0.005, settings.RetreatStepM);
        for (var back = step; base0 + back <= limit + 1e-9; back += step)
        {
            if (checker.IsFree(path[^1]) && checker.SceneClearanceM(path[^1]) >= settings.ClearanceTargetM && stations[^1] >= settings.MinRetreatM - 1e-9)
            {
                return;
            }

            var next = new double[path[^1].Length];
            var attempt = ik.SolveFromSeed(CutPoses.BackedOff(from, back), path[^1], next);
            if (!attempt.Converged || !chain.WithinLimits(next) || Jumps(path[^1], next, settings.MaxApproachJointStep) || !checker.IsEdgeFree(path[^1], next, ignore))
            {
                return;
            }

            path.Add(next);
            stations.Add(base0 + back);
            groups.Add(ignore);
        }
    }

    /// <summary>Tolerance for recognising a reported configuration as one of an approach path's (controller rounding).</summary>
    public const double OnPathToleranceRad = 1e-6;

    /// <summary>The approach whose path holds this configuration, and its index there; null when none does.</summary>
    private static (CutCandidate Candidate, int LimbGroup, int Index)? OnApproach(double[] q, IEnumerable<(CutCandidate Candidate, int LimbGroup)>? approaches)
    {
        foreach (var (candidate, limb) in approaches ?? [])
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
                    return (candidate, limb, i);
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
        new(condition, [q], [0.0], clearance, joint, link, touches, message, []);
}
