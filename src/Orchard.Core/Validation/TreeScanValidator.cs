using Orchard.Core.Model;
using Orchard.Core.Reachability;

namespace Orchard.Core.Validation;

/// <summary>
/// Checks a tree scan and reports every problem at once, each with its JSON path. Errors make the scan
/// unplannable; warnings flag what is outside the trade's usual ranges. Never throws on any input,
/// including nulls where the model expects values (as a JSON reader leaves missing fields).
/// </summary>
public static class TreeScanValidator
{
    /// <param name="scan">The scan to check.</param>
    /// <param name="limits">Size limits and plausibility ranges; <see cref="ScanLimits.Default"/> when null.</param>
    /// <param name="shearRatingMm">The shear's rated diameter; cuts above it are flagged as warnings when given.</param>
    public static ValidationReport Validate(TreeScan? scan, ScanLimits? limits = null, double? shearRatingMm = null)
    {
        limits ??= ScanLimits.Default;
        var problems = new ProblemCollector();
        if (scan is null)
        {
            problems.Error("$", "document.missing", "A tree scan is required.");
            return problems.ToReport();
        }

        problems.Identifier(scan.TreeId, limits.MaxIdLength, "$.treeId");
        problems.Label(scan.Block, limits.MaxIdLength, "$.block");
        problems.Label(scan.Row, limits.MaxIdLength, "$.row");
        if (scan.PositionInRow is < 0 or > 100_000)
        {
            problems.Error("$.positionInRow", "tree.positionInRow", $"Must be between 0 and 100000; it is {scan.PositionInRow}.");
        }

        if (scan.ScannedAt == default)
        {
            problems.Error("$.scannedAt", "field.missing", "The scan time is required (ISO 8601 with offset).");
        }

        if (problems.Present(scan.ArmBase, "$.armBase"))
        {
            problems.Vector(scan.ArmBase.PositionM, limits.MaxCoordinateM, "$.armBase.positionM");
            problems.Finite(scan.ArmBase.YawRad, "$.armBase.yawRad");
        }

        var nodeIndex = CheckNodes(scan.Nodes, limits, problems);
        var branchIndex = CheckBranches(scan.Branches, nodeIndex, limits, problems);
        if (nodeIndex is not null && branchIndex is not null)
        {
            BranchGraphCheck.Run(scan.Nodes, scan.Branches, nodeIndex, problems);
            CheckHeight(scan.Nodes, limits, problems);
        }

        CheckObstacles(scan.Obstacles, limits, problems);
        CheckCuts(scan, branchIndex, nodeIndex, limits, shearRatingMm, problems);
        return problems.ToReport();
    }

    /// <summary>Node ids to their index, or null when the list is unusable.</summary>
    private static Dictionary<string, int>? CheckNodes(IReadOnlyList<ScanNode>? nodes, ScanLimits limits, ProblemCollector problems)
    {
        if (!problems.Present(nodes, "$.nodes"))
        {
            return null;
        }

        if (nodes!.Count == 0)
        {
            problems.Error("$.nodes", "nodes.empty", "A scan needs at least one node (the trunk base).");
            return null;
        }

        if (nodes.Count > limits.MaxNodes)
        {
            problems.Error("$.nodes", "nodes.tooMany", $"At most {limits.MaxNodes} nodes; there are {nodes.Count}.");
            return null;
        }

        var index = new Dictionary<string, int>(nodes.Count, StringComparer.Ordinal);
        var usable = true;
        for (var i = 0; i < nodes.Count; i++)
        {
            var path = $"$.nodes[{i}]";
            var node = nodes[i];
            if (!problems.Present(node, path))
            {
                usable = false;
                continue;
            }

            problems.InRange(node.XM, -limits.MaxCoordinateM, limits.MaxCoordinateM, path + ".xM", "coordinate.outOfRange", "A coordinate");
            problems.InRange(node.YM, -limits.MaxCoordinateM, limits.MaxCoordinateM, path + ".yM", "coordinate.outOfRange", "A coordinate");
            problems.InRange(node.ZM, -limits.MaxCoordinateM, limits.MaxCoordinateM, path + ".zM", "coordinate.outOfRange", "A coordinate");
            if (!problems.Identifier(node.Id, limits.MaxIdLength, path + ".id"))
            {
                usable = false;
                continue;
            }

            if (!index.TryAdd(node.Id, i))
            {
                problems.Error(path + ".id", "id.duplicate", $"Node id '{node.Id}' is already used by $.nodes[{index[node.Id]}].");
            }
        }

        return usable ? index : null;
    }

    /// <summary>Branch ids to their index, or null when the list is unusable.</summary>
    private static Dictionary<string, int>? CheckBranches(IReadOnlyList<Branch>? branches, Dictionary<string, int>? nodeIndex, ScanLimits limits, ProblemCollector problems)
    {
        if (!problems.Present(branches, "$.branches"))
        {
            return null;
        }

        if (branches!.Count > limits.MaxBranches)
        {
            problems.Error("$.branches", "branches.tooMany", $"At most {limits.MaxBranches} branches; there are {branches.Count}.");
            return null;
        }

        var index = new Dictionary<string, int>(branches.Count, StringComparer.Ordinal);
        var usable = true;
        for (var i = 0; i < branches.Count; i++)
        {
            var path = $"$.branches[{i}]";
            var branch = branches[i];
            if (!problems.Present(branch, path))
            {
                usable = false;
                continue;
            }

            problems.Positive(branch.FromRadiusM, limits.MaxRadiusM, path + ".fromRadiusM", "radius.notPositive", "A branch radius");
            problems.Positive(branch.ToRadiusM, limits.MaxRadiusM, path + ".toRadiusM", "radius.notPositive", "A branch radius");
            var endsKnown = CheckNodeReference(branch.FromNode, nodeIndex, path + ".fromNode", limits, problems);
            endsKnown &= CheckNodeReference(branch.ToNode, nodeIndex, path + ".toNode", limits, problems);
            if (endsKnown && string.Equals(branch.FromNode, branch.ToNode, StringComparison.Ordinal))
            {
                problems.Error(path + ".toNode", "graph.selfLoop", $"A branch cannot start and end at the same node '{branch.FromNode}' (a cycle).");
            }

            if (!problems.Identifier(branch.Id, limits.MaxIdLength, path + ".id"))
            {
                usable = false;
                continue;
            }

            if (!index.TryAdd(branch.Id, i))
            {
                problems.Error(path + ".id", "id.duplicate", $"Branch id '{branch.Id}' is already used by $.branches[{index[branch.Id]}].");
            }
        }

        return usable ? index : null;
    }

    private static bool CheckNodeReference(string? nodeId, Dictionary<string, int>? nodeIndex, string path, ScanLimits limits, ProblemCollector problems)
    {
        if (!problems.Identifier(nodeId, limits.MaxIdLength, path))
        {
            return false;
        }

        if (nodeIndex is not null && !nodeIndex.ContainsKey(nodeId!))
        {
            problems.Error(path, "reference.missingNode", $"No node has id '{nodeId}'.");
            return false;
        }

        return nodeIndex is not null;
    }

    private static void CheckHeight(IReadOnlyList<ScanNode> nodes, ScanLimits limits, ProblemCollector problems)
    {
        var low = double.PositiveInfinity;
        var high = double.NegativeInfinity;
        foreach (var node in nodes)
        {
            if (double.IsFinite(node.ZM))
            {
                low = Math.Min(low, node.ZM);
                high = Math.Max(high, node.ZM);
            }
        }

        var height = high - Math.Min(low, 0.0);
        if (double.IsFinite(height) && (height < limits.MinPlausibleHeightM || height > limits.MaxPlausibleHeightM))
        {
            problems.Warning("$.nodes", "tree.heightUnusual", $"The tree is {height:F2} m tall; high-density trees are usually {limits.MinPlausibleHeightM:G}–{limits.MaxPlausibleHeightM:G} m.");
        }
    }

    private static void CheckObstacles(IReadOnlyList<Obstacle>? obstacles, ScanLimits limits, ProblemCollector problems)
    {
        if (!problems.Present(obstacles, "$.obstacles"))
        {
            return;
        }

        if (obstacles!.Count > limits.MaxObstacles)
        {
            problems.Error("$.obstacles", "obstacles.tooMany", $"At most {limits.MaxObstacles} obstacles; there are {obstacles.Count}.");
            return;
        }

        var ids = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var i = 0; i < obstacles.Count; i++)
        {
            var path = $"$.obstacles[{i}]";
            var obstacle = obstacles[i];
            if (!problems.Present(obstacle, path))
            {
                continue;
            }

            if (problems.Identifier(obstacle.Id, limits.MaxIdLength, path + ".id") && !ids.TryAdd(obstacle.Id, i))
            {
                problems.Error(path + ".id", "id.duplicate", $"Obstacle id '{obstacle.Id}' is already used by $.obstacles[{ids[obstacle.Id]}].");
            }

            if (!Enum.IsDefined(obstacle.Kind))
            {
                problems.Error(path + ".kind", "enum.unknown", "Must be one of: wire, post, other.");
            }

            problems.Vector(obstacle.StartM, limits.MaxCoordinateM, path + ".startM");
            problems.Vector(obstacle.EndM, limits.MaxCoordinateM, path + ".endM");
            problems.Positive(obstacle.RadiusM, limits.MaxRadiusM, path + ".radiusM", "radius.notPositive", "An obstacle radius");
        }
    }

    /// <summary>stubLengthM belongs to renewal cuts and backToBranchId to cut backs, each required there and refused elsewhere.</summary>
    private static void CheckKindFields(Cut cut, string path, ScanLimits limits, ProblemCollector problems)
    {
        if (cut.Kind == CutKind.Renewal)
        {
            if (cut.StubLengthM is not { } stubM)
            {
                problems.Error(path + ".stubLengthM", "field.missing", "A renewal cut needs stubLengthM: the stub to leave outside the parent, metres.");
            }
            else if (problems.Positive(stubM, 1.0, path + ".stubLengthM", "cut.stubNotPositive", "The stub length")
                && (stubM < limits.MinPlausibleStubM || stubM > limits.MaxPlausibleStubM))
            {
                problems.Warning(path + ".stubLengthM", "cut.stubUnusual", $"A {stubM * 1000:F0} mm stub is outside the usual {limits.MinPlausibleStubM * 1000:F0}–{limits.MaxPlausibleStubM * 1000:F0} mm for a renewal cut.");
            }
        }
        else if (cut.StubLengthM is not null)
        {
            problems.Error(path + ".stubLengthM", "cut.fieldNotForKind", $"Only renewal cuts take stubLengthM; this is a {KindName(cut.Kind)} cut.");
        }

        if (cut.Kind == CutKind.CutBack)
        {
            problems.Identifier(cut.BackToBranchId, limits.MaxIdLength, path + ".backToBranchId");
        }
        else if (cut.BackToBranchId is not null)
        {
            problems.Error(path + ".backToBranchId", "cut.fieldNotForKind", $"Only cutBack cuts take backToBranchId; this is a {KindName(cut.Kind)} cut.");
        }
    }

    /// <summary>
    /// Where a cut back or renewal cut sits (<see cref="CutPlacement"/>), with the problems that keep it from a
    /// place: a side branch that is missing or grows elsewhere, a stub or clearance longer than the branch.
    /// </summary>
    private static bool PlacedByKind(TreeScan scan, Cut cut, Branch branch, Dictionary<string, int> branchIndex, string path, ScanLimits limits, ProblemCollector problems, out double position)
    {
        position = 0;
        if (cut.Kind == CutKind.CutBack)
        {
            if (cut.BackToBranchId is null || string.IsNullOrWhiteSpace(cut.BackToBranchId))
            {
                return false; // Reported by CheckKindFields.
            }

            if (!branchIndex.TryGetValue(cut.BackToBranchId, out var s))
            {
                problems.Error(path + ".backToBranchId", "reference.missingBranch", $"No branch has id '{cut.BackToBranchId}'.");
                return false;
            }

            var side = scan.Branches[s];
            if (side.Id == branch.Id)
            {
                problems.Error(path + ".backToBranchId", "cut.backToItself", "A cut back shortens a limb to another branch, not to the branch being cut.");
                return false;
            }

            if (side.FromNode != branch.FromNode)
            {
                problems.Error(path + ".backToBranchId", "cut.sideBranchElsewhere",
                    $"Side branch '{side.Id}' grows from node '{side.FromNode}'; a cut back to it sits on a branch starting there, and '{branch.Id}' starts at '{branch.FromNode}'.");
                return false;
            }

            if (double.IsFinite(cut.DiameterMm) && cut.DiameterMm > 0 && 2000.0 * side.FromRadiusM < limits.MinCutBackSideRatio * cut.DiameterMm)
            {
                problems.Warning(path + ".backToBranchId", "cut.sideBranchThin",
                    $"Side branch '{side.Id}' ({2000.0 * side.FromRadiusM:F1} mm) is thinner than a third of the {cut.DiameterMm:F1} mm cut back to it; it may not take over as the limb's end.");
            }
        }
        else if (cut.StubLengthM is not { } stubM || !(stubM > 0) || !double.IsFinite(stubM))
        {
            return false; // Reported by CheckKindFields.
        }

        if (CutPlacement.Locate(scan, cut) is not { } location)
        {
            return false; // A node of the branch is missing: reported with the branches.
        }

        if (!location.FitsOnBranch)
        {
            var what = cut.Kind == CutKind.Renewal
                ? $"The stub and the parent's radius ({location.DistanceFromParentEndM * 1000:F0} mm in all)"
                : $"The side branch's base and the clearance beyond it ({location.DistanceFromParentEndM * 1000:F0} mm in all)";
            problems.Error(path + (cut.Kind == CutKind.Renewal ? ".stubLengthM" : ".branchId"), "cut.beyondBranch",
                $"{what} reach past the end of branch '{branch.Id}' ({location.BranchLengthM * 1000:F0} mm long).");
            return false;
        }

        position = location.PositionAlong;
        return true;
    }

    private static string KindName(CutKind kind) => kind switch
    {
        CutKind.Thinning => "thinning",
        CutKind.Heading => "heading",
        CutKind.CutBack => "cutBack",
        CutKind.Renewal => "renewal",
        _ => kind.ToString(),
    };

    private static void CheckCuts(TreeScan scan, Dictionary<string, int>? branchIndex, Dictionary<string, int>? nodeIndex, ScanLimits limits, double? shearRatingMm, ProblemCollector problems)
    {
        var cuts = scan.Cuts;
        if (!problems.Present(cuts, "$.cuts"))
        {
            return;
        }

        if (cuts!.Count > limits.MaxCuts)
        {
            problems.Error("$.cuts", "cuts.tooMany", $"At most {limits.MaxCuts} cuts; there are {cuts.Count}.");
            return;
        }

        if (cuts.Count > limits.MaxPlausibleCuts)
        {
            problems.Warning("$.cuts", "cuts.manyForOneTree", $"{cuts.Count} cuts on one tree; dormant pruning of a trained tree rarely needs more than {limits.MaxPlausibleCuts}.");
        }

        var ids = new Dictionary<string, int>(cuts.Count, StringComparer.Ordinal);
        var places = new Dictionary<(string Branch, double Position), int>();
        for (var i = 0; i < cuts.Count; i++)
        {
            var path = $"$.cuts[{i}]";
            var cut = cuts[i];
            if (!problems.Present(cut, path))
            {
                continue;
            }

            if (problems.Identifier(cut.Id, limits.MaxIdLength, path + ".id") && !ids.TryAdd(cut.Id, i))
            {
                problems.Error(path + ".id", "id.duplicate", $"Cut id '{cut.Id}' is already used by $.cuts[{ids[cut.Id]}].");
            }

            if (!Enum.IsDefined(cut.Kind))
            {
                problems.Error(path + ".kind", "enum.unknown", "Must be one of: thinning, heading, cutBack, renewal.");
            }

            CheckKindFields(cut, path, limits, problems);

            var positionOk = problems.InRange(cut.PositionAlong, 0.0, 1.0, path + ".positionAlong", "cut.positionOutOfRange", "The position along the branch");
            var diameterOk = problems.Positive(cut.DiameterMm, limits.MaxCutDiameterMm, path + ".diameterMm", "diameter.notPositive", "A cut diameter");
            if (diameterOk && shearRatingMm is { } rating && cut.DiameterMm > rating)
            {
                problems.Warning(path + ".diameterMm", "cut.aboveShearRating", $"{cut.DiameterMm:F1} mm is above the shear's {rating:G} mm rating; it will be reported unreachable.");
            }

            if (!problems.Identifier(cut.BranchId, limits.MaxIdLength, path + ".branchId"))
            {
                continue;
            }

            if (branchIndex is null)
            {
                continue;
            }

            if (!branchIndex.TryGetValue(cut.BranchId, out var b))
            {
                problems.Error(path + ".branchId", "reference.missingBranch", $"No branch has id '{cut.BranchId}'.");
                continue;
            }

            var branch = scan.Branches[b];
            var position = cut.PositionAlong;
            if (cut.Kind is CutKind.CutBack or CutKind.Renewal)
            {
                if (nodeIndex is null || !PlacedByKind(scan, cut, branch, branchIndex, path, limits, problems, out position))
                {
                    continue;
                }

                if (positionOk && cut.PositionAlong != 0 && Math.Abs(cut.PositionAlong - position) > 0.01)
                {
                    problems.Warning(path + ".positionAlong", "cut.positionFromKind", $"A {KindName(cut.Kind)} cut sits where its kind puts it ({position:F3} along the branch); the {cut.PositionAlong:G} given is not used.");
                }
            }

            if (positionOk && !places.TryAdd((cut.BranchId, position), i))
            {
                problems.Warning(path, "cut.samePlace", $"Same branch and position as $.cuts[{places[(cut.BranchId, position)]}].");
            }

            if (positionOk && diameterOk && nodeIndex is not null)
            {
                var woodMm = 2000.0 * (branch.FromRadiusM + ((branch.ToRadiusM - branch.FromRadiusM) * position));
                if (double.IsFinite(woodMm) && woodMm > 0 && Math.Abs(cut.DiameterMm - woodMm) > 0.5 * woodMm + 2.0)
                {
                    problems.Warning(path + ".diameterMm", "cut.diameterDisagrees", $"{cut.DiameterMm:F1} mm differs from the scanned wood there ({woodMm:F1} mm).");
                }
            }
        }
    }
}
