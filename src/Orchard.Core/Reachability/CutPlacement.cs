using Orchard.Core.Geometry;
using Orchard.Core.Model;

namespace Orchard.Core.Reachability;

/// <summary>
/// Where a cut sits on its branch, from its kind. Thinning and heading cuts sit where the scan marks them
/// (<see cref="Cut.PositionAlong"/>). The other two follow from the wood around them:
/// <list type="bullet">
/// <item><see cref="CutKind.CutBack"/>: on the branch being shortened, just beyond the side branch it is cut
/// back to (which grows from the same node). The side branch's surface crosses the shortened branch's
/// axis r / sin θ out from the junction (r its base radius, θ the angle between the two branches, taken as
/// at least <see cref="MinCutBackAngleRad"/>); the cut sits <see cref="CutBackClearanceM"/> beyond that.</item>
/// <item><see cref="CutKind.Renewal"/>: <see cref="Cut.StubLengthM"/> out from the parent's surface, i.e. the
/// parent's radius at the junction (the end radius of the branch that ends where this one starts) plus
/// the stub, from the junction node along the branch.</item>
/// </list>
/// In every case the shear closes across the branch the cut is on, so the pose (point and branch axis)
/// follows from the position.
/// </summary>
public static class CutPlacement
{
    /// <summary>
    /// How far beyond the side branch a cut back sits, 30 mm. By hand a pruner cuts a few millimetres beyond
    /// the side branch's collar (common practice); a machine's shear has jaws and a body around the blade,
    /// and on the demo trees no approach within about 20 mm of a junction was free of the side branch, so the
    /// machine leaves a short stub (as it does for thinning cuts). Our choice, not a sourced figure.
    /// </summary>
    public const double CutBackClearanceM = 0.03;

    /// <summary>Branches closer together than 15° are treated as 15° apart, so a side branch lying along the limb does not push the cut out without bound.</summary>
    public const double MinCutBackAngleRad = 15 * Math.PI / 180;

    /// <summary>
    /// Where <paramref name="cut"/> sits, or null when the references its kind needs do not resolve
    /// (a missing branch, node or side branch, a missing stub length) or the kind's side branch does not grow
    /// from the node where the cut's branch starts. Never throws on a scan that has not been validated.
    /// </summary>
    public static CutLocation? Locate(TreeScan scan, Cut cut)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(cut);
        var branch = FindBranch(scan, cut.BranchId);
        if (branch is null || FindNode(scan, branch.FromNode) is not { } from || FindNode(scan, branch.ToNode) is not { } to)
        {
            return null;
        }

        var lengthM = Vec3.Distance(from, to);
        if (!(lengthM > 0))
        {
            return null;
        }

        double distanceM;
        switch (cut.Kind)
        {
            case CutKind.CutBack:
                var side = cut.BackToBranchId is null ? null : FindBranch(scan, cut.BackToBranchId);
                if (side is null || side.Id == branch.Id || side.FromNode != branch.FromNode)
                {
                    return null;
                }

                if (FindNode(scan, side.ToNode) is not { } sideEnd || !(Vec3.Distance(from, sideEnd) > 0))
                {
                    return null;
                }

                var sinAngle = Vec3.Cross((to - from).Normalized(), (sideEnd - from).Normalized()).Length;
                distanceM = (side.FromRadiusM / Math.Max(sinAngle, Math.Sin(MinCutBackAngleRad))) + CutBackClearanceM;
                break;
            case CutKind.Renewal:
                if (cut.StubLengthM is not { } stubM)
                {
                    return null;
                }

                distanceM = ParentRadiusAtM(scan, branch) + stubM;
                break;
            default:
                return new CutLocation(cut.PositionAlong, cut.PositionAlong * lengthM, lengthM);
        }

        return new CutLocation(distanceM / lengthM, distanceM, lengthM);
    }

    /// <summary>The position along the branch (0..1) for planning; the scan must have passed validation.</summary>
    public static double PositionAlong(TreeScan scan, Cut cut) =>
        cut?.Kind is CutKind.Thinning or CutKind.Heading ? cut.PositionAlong
        : Locate(scan, cut!) is { } location
            ? Math.Clamp(location.PositionAlong, 0.0, 1.0)
            : throw new ArgumentException($"Cut '{cut?.Id}' cannot be placed on its branch; validate scans before planning.", nameof(cut));

    /// <summary>
    /// The parent's radius where <paramref name="branch"/> starts: the end radius of the branch that ends at
    /// its parent-end node (0 at the root, where nothing ends).
    /// </summary>
    public static double ParentRadiusAtM(TreeScan scan, Branch branch)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(branch);
        foreach (var b in scan.Branches)
        {
            if (b is not null && b.ToNode == branch.FromNode)
            {
                return b.ToRadiusM;
            }
        }

        return 0.0;
    }

    private static Branch? FindBranch(TreeScan scan, string? id)
    {
        if (id is null || scan.Branches is null)
        {
            return null;
        }

        foreach (var b in scan.Branches)
        {
            if (b is not null && b.Id == id)
            {
                return b;
            }
        }

        return null;
    }

    private static Vec3? FindNode(TreeScan scan, string? id)
    {
        if (id is null || scan.Nodes is null)
        {
            return null;
        }

        foreach (var n in scan.Nodes)
        {
            if (n is not null && n.Id == id)
            {
                return new Vec3(n.XM, n.YM, n.ZM);
            }
        }

        return null;
    }
}
