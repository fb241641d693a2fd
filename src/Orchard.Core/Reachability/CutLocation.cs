namespace Orchard.Core.Reachability;

/// <summary>Where a cut sits on its branch (see <see cref="CutPlacement"/>).</summary>
/// <param name="PositionAlong">0 at the branch's parent end, 1 at its child end; above 1 when the kind puts the cut beyond the branch.</param>
/// <param name="DistanceFromParentEndM">From the branch's parent-end node along the branch, metres.</param>
/// <param name="BranchLengthM">The branch's length, metres.</param>
public readonly record struct CutLocation(double PositionAlong, double DistanceFromParentEndM, double BranchLengthM)
{
    /// <summary>The kind's place lies on the branch (not beyond its child end).</summary>
    public bool FitsOnBranch => PositionAlong <= 1.0;
}
