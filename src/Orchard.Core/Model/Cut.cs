namespace Orchard.Core.Model;

/// <summary>A cut marked on a branch.</summary>
/// <param name="Id">Unique within the scan.</param>
/// <param name="BranchId">The branch the shear closes on (for a cut back, the branch being shortened).</param>
/// <param name="PositionAlong">
/// 0 at the branch's parent end, 1 at its child end: where a thinning or heading cut sits. A cut back or a
/// renewal cut sits where its kind puts it, and this may be left out (0); when given, it is checked against that place.
/// </param>
/// <param name="Kind">Thinning, heading, cut back or renewal.</param>
/// <param name="DiameterMm">Wood diameter at the cut, millimetres (as measured or as marked).</param>
/// <param name="StubLengthM">Renewal cuts only: the stub left outside the parent's surface, metres.</param>
/// <param name="BackToBranchId">Cut backs only: the side branch the limb is shortened to; it grows from the node where <paramref name="BranchId"/> starts.</param>
public sealed record Cut(
    string Id,
    string BranchId,
    double PositionAlong,
    CutKind Kind,
    double DiameterMm,
    double? StubLengthM = null,
    string? BackToBranchId = null);
