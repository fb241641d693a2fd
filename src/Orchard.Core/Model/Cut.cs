namespace Orchard.Core.Model;

/// <summary>A cut marked on a branch.</summary>
/// <param name="Id">Unique within the scan.</param>
/// <param name="BranchId">The branch the shear closes on.</param>
/// <param name="PositionAlong">0 at the branch's parent end, 1 at its child end.</param>
/// <param name="Kind">Thinning or heading.</param>
/// <param name="DiameterMm">Wood diameter at the cut, millimetres (as measured or as marked).</param>
public sealed record Cut(string Id, string BranchId, double PositionAlong, CutKind Kind, double DiameterMm);
