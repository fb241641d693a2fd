using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;
using Orchard.Core.Randomness;

namespace Orchard.Core.Reachability;

/// <summary>
/// Finds, for each cut of a tree, the approaches the arm can use: shear poses perpendicular to the
/// branch within a cone facing the arm (both jaw orientations), joint solutions for each, the pre-cut
/// pose at the stand-off, and the straight approach between them checked edge by edge (only the
/// tool may touch the limb being cut, and only on the approach). A cut with no usable candidate is
/// reported with the reason: above the shear's rating, out of reach, joint limits, or collision.
/// </summary>
public static class ReachabilityAnalyzer
{
    public static IReadOnlyList<CutReachability> Analyze(WorkCell cell, ReachabilitySettings settings, ulong seed, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(settings);
        var checker = cell.CreateChecker();
        var ik = new InverseKinematics(cell.Chain, settings.InverseKinematics);
        var results = new CutReachability[cell.Scan.Cuts.Count];
        for (var c = 0; c < results.Length; c++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            results[c] = AnalyzeCut(cell, checker, ik, settings, c, DeterministicRandom.ForStream(seed, (ulong)c));
        }

        return results;
    }

    /// <summary>One cut; its randomness comes from its own stream, so cuts can be analysed in any order.</summary>
    public static CutReachability AnalyzeCut(WorkCell cell, CollisionChecker checker, InverseKinematics ik, ReachabilitySettings settings, int cutIndex, DeterministicRandom random)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(checker);
        ArgumentNullException.ThrowIfNull(ik);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(random);
        var scan = cell.Scan;
        var cut = scan.Cuts[cutIndex];
        var branchIndex = IndexOfBranch(scan, cut.BranchId);
        var limb = cell.Scene.LimbOfBranch[branchIndex];
        var rating = cell.Profile.Tool.MaxCutDiameterMm;
        if (cut.DiameterMm > rating)
        {
            return new CutReachability(cutIndex, cut.Id, limb, [], UnreachableReason.AboveShearRating,
                $"{cut.DiameterMm:F1} mm wood; the shear is rated for {rating:G} mm.");
        }

        var (point, axis) = CutPointAndAxis(scan, branchIndex, CutPlacement.PositionAlong(scan, cut));
        var facing = CutPoses.FacingApproach(point, axis, cell.BasePositionM);
        var n = cell.Chain.JointCount;
        var aimed = AimedSeed(cell, point);
        var candidates = new List<CutCandidate>();
        var bestMissM = double.PositiveInfinity;
        var anySolution = false;
        var buffer = new double[n];
        string? blockedBy = null;

        foreach (var angle in ApproachAngles(settings))
        {
            if (candidates.Count >= settings.EnoughCandidates)
            {
                break; // Enough to choose from; the approaches nearest the facing direction came first.
            }

            foreach (var flipped in settings.BothJawOrientations ? new[] { false, true } : [false])
            {
                var pose = CutPoses.ShearPose(point, axis, facing, angle, flipped);
                var result = ik.Solve(pose, aimed, random);
                if (!result.Found)
                {
                    var attempt = ik.SolveFromSeed(pose, aimed, buffer);
                    bestMissM = Math.Min(bestMissM, attempt.PositionErrorM);
                    continue;
                }

                bestMissM = 0;
                anySolution = true;
                foreach (var solution in result.Solutions.Take(settings.SolutionsPerPose))
                {
                    var approach = ApproachPath(cell, checker, ik, settings, pose, solution.Joints.ToArray(), limb, out var blocker);
                    if (approach is null)
                    {
                        blockedBy ??= blocker;
                        continue;
                    }

                    var (path, stations, preCutIndex) = approach.Value;
                    candidates.Add(new CutCandidate(cutIndex, 0, angle, flipped, path, stations, preCutIndex, checker.SceneClearanceM(path[0])));
                }
            }
        }

        if (candidates.Count == 0)
        {
            var reason = anySolution ? UnreachableReason.Collision
                : bestMissM > settings.OutOfReachMissM ? UnreachableReason.OutOfReach
                : UnreachableReason.JointLimits;
            var detail = reason switch
            {
                UnreachableReason.Collision => blockedBy is null
                    ? "Every joint solution touches wood, trellis, ground or the arm itself at the cut, the pre-cut pose or on the approach."
                    : $"Every joint solution touches something at the cut, the pre-cut pose or on the approach; the most direct one: {blockedBy}.",
                UnreachableReason.OutOfReach => $"The shear gets no nearer than {bestMissM * 1000:F0} mm to the cut pose from this stand.",
                _ => $"The shear reaches the cut, but no approach pose has a joint solution within the limits (best {bestMissM * 1000:F0} mm off).",
            };
            return new CutReachability(cutIndex, cut.Id, limb, [], reason, detail,
                reason == UnreachableReason.Collision ? null : bestMissM,
                reason == UnreachableReason.Collision ? blockedBy : null);
        }

        var kept = candidates
            .OrderByDescending(c => c.ClearanceM)
            .ThenBy(c => Math.Abs(c.ApproachAngleRad))
            .Take(settings.MaxCandidatesPerCut)
            .Select((c, i) => c with { CandidateIndex = i })
            .ToArray();
        return new CutReachability(cutIndex, cut.Id, limb, kept, null, null);
    }

    /// <summary>The cut point on the branch axis and the branch's unit direction (away from the root).</summary>
    public static (Vec3 Point, Vec3 Axis) CutPointAndAxis(TreeScan scan, int branchIndex, double positionAlong)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var branch = scan.Branches[branchIndex];
        var from = scan.Nodes.First(n => n.Id == branch.FromNode);
        var to = scan.Nodes.First(n => n.Id == branch.ToNode);
        var a = new Vec3(from.XM, from.YM, from.ZM);
        var b = new Vec3(to.XM, to.YM, to.ZM);
        return (Vec3.Lerp(a, b, positionAlong), (b - a).Normalized());
    }

    private static int IndexOfBranch(TreeScan scan, string branchId)
    {
        for (var i = 0; i < scan.Branches.Count; i++)
        {
            if (scan.Branches[i].Id == branchId)
            {
                return i;
            }
        }

        throw new ArgumentException($"No branch '{branchId}' in the scan; validate scans before planning.", nameof(scan));
    }

    /// <summary>Approach angles across the cone, the facing direction first, then outwards.</summary>
    private static IEnumerable<double> ApproachAngles(ReachabilitySettings settings)
    {
        var count = Math.Max(1, settings.ApproachDirections);
        var angles = count == 1
            ? [0.0]
            : Enumerable.Range(0, count).Select(i => -settings.ApproachConeHalfAngleRad + (2 * settings.ApproachConeHalfAngleRad * i / (count - 1)));
        return angles.OrderBy(Math.Abs).ThenBy(a => a);
    }

    /// <summary>
    /// The straight approach as configurations from the clear pose (first) through the pre-cut pose to
    /// the cut (last), following the approach axis backwards from the cut solution: first the stand-off
    /// (where only the tool may touch the limb being cut), then on out, still in a straight line, until
    /// the arm has <see cref="ReachabilitySettings.ClearanceTargetM"/> of room or the retreat reaches
    /// <see cref="ReachabilitySettings.MaxRetreatM"/> (the farthest free pose is kept then). Null when the
    /// solution jumps, leaves the limits or collides before the pre-cut pose; <paramref name="blocker"/>
    /// then says what it touched, when a configuration did.
    /// </summary>
    private static (double[][] Path, double[] Stations, int PreCutIndex)? ApproachPath(WorkCell cell, CollisionChecker checker, InverseKinematics ik, ReachabilitySettings settings, in Pose3 cutPose, double[] cutConfiguration, int limb, out string? blocker)
    {
        blocker = null;
        if (!checker.IsFree(cutConfiguration, limb))
        {
            blocker = Describe(cell, checker, cutConfiguration, limb);
            return null;
        }

        // Backwards from the cut: reversed[0] is the cut, distances grow.
        var reversed = new List<double[]> { cutConfiguration };
        var distances = new List<double> { 0.0 };
        var steps = Math.Max(1, settings.ApproachSteps);
        var standOff = cell.Profile.ApproachStandOffM;
        for (var i = 1; i <= steps; i++)
        {
            var next = Follow(cell, ik, settings, cutPose, reversed[^1], standOff * i / steps);
            if (next is null)
            {
                return null;
            }

            reversed.Add(next);
            distances.Add(standOff * i / steps);
        }

        // The pre-cut pose is where the slow part starts: it must be clear of everything, the cut limb included.
        if (!checker.IsFree(reversed[^1]))
        {
            blocker = Describe(cell, checker, reversed[^1], CapsuleBvh.NoGroup);
            return null;
        }

        for (var i = 0; i < steps; i++)
        {
            if (!checker.IsEdgeFree(reversed[i + 1], reversed[i], limb))
            {
                return null;
            }
        }

        // On out to a clear pose, every configuration and edge free of everything.
        var preCutFromEnd = reversed.Count - 1;
        var retreat = 0.0;
        while (checker.SceneClearanceM(reversed[^1]) < settings.ClearanceTargetM && retreat + 1e-9 < settings.MaxRetreatM)
        {
            retreat = Math.Min(settings.MaxRetreatM, retreat + settings.RetreatStepM);
            var next = Follow(cell, ik, settings, cutPose, reversed[^1], standOff + retreat);
            if (next is null || !checker.IsFree(next) || !checker.IsEdgeFree(reversed[^1], next))
            {
                break;
            }

            reversed.Add(next);
            distances.Add(standOff + retreat);
        }

        reversed.Reverse();
        var total = distances[^1];
        var stations = distances.Select(d => total - d).Reverse().ToArray();
        return (reversed.ToArray(), stations, reversed.Count - 1 - preCutFromEnd);
    }

    /// <summary>The joint solution for the cut pose backed off by <paramref name="backM"/>, followed from <paramref name="previous"/>; null when it jumps or leaves the limits.</summary>
    private static double[]? Follow(WorkCell cell, InverseKinematics ik, ReachabilitySettings settings, in Pose3 cutPose, double[] previous, double backM)
    {
        var pose = CutPoses.BackedOff(cutPose, backM);
        var next = new double[previous.Length];
        var attempt = ik.SolveFromSeed(pose, previous, next);
        if (!attempt.Converged || !cell.Chain.WithinLimits(next))
        {
            return null;
        }

        for (var j = 0; j < next.Length; j++)
        {
            if (Math.Abs(next[j] - previous[j]) > settings.MaxApproachJointStep)
            {
                return null;
            }
        }

        return next;
    }

    private static string? Describe(WorkCell cell, CollisionChecker checker, double[] q, int limb)
    {
        var report = checker.Check(q, limb);
        var contact = ContactDescription.Of(cell, report);
        return contact.Touches is null ? null : $"the {contact.ArmLink ?? "arm"} touches {contact.Touches} ({report.ClearanceM * 1000:F0} mm)";
    }

    /// <summary>
    /// A seed aimed at the cut for arms that start with a vertical lift and a turret (as the demo arm
    /// does): the lift brings the shoulder level with the cut and the turret faces it; the rest of
    /// the arm as stowed. Other arms get the stow configuration.
    /// </summary>
    private static double[] AimedSeed(WorkCell cell, in Vec3 target)
    {
        var chain = cell.Chain;
        var seed = cell.Profile.StowConfiguration.ToArray();
        var joints = cell.Profile.Joints;
        if (joints.Count >= 3 && joints[0].Kind == JointKind.Prismatic && joints[1].Kind == JointKind.Revolute
            && Math.Abs(joints[0].Axis.Z) > 0.99 && Math.Abs(joints[1].Axis.Z) > 0.99)
        {
            var frames = new Pose3[chain.JointCount];
            var zero = seed.ToArray();
            zero[0] = 0;
            zero[1] = 0;
            chain.ForwardKinematics(zero, frames);
            var shoulderAtZero = frames[2].Translation;
            seed[0] = Math.Clamp((target.Z - shoulderAtZero.Z) * Math.Sign(joints[0].Axis.Z), chain.LowerLimits[0], chain.UpperLimits[0]);
            var inBase = chain.BaseInRoot.Inverse().TransformPoint(target);
            var heading = Math.Atan2(inBase.Y, inBase.X) * Math.Sign(joints[1].Axis.Z);
            seed[1] = Math.Clamp(heading, chain.LowerLimits[1], chain.UpperLimits[1]);
        }

        return seed;
    }
}
