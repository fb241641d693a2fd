namespace Orchard.Core.Reachability;

/// <summary>What the arm can do about one cut from one stand: its usable candidates, or why there are none.</summary>
/// <param name="ShortfallM">When out of reach or at the joint limits: how far the shear stayed from the cut pose at best.</param>
/// <param name="BlockedBy">When every approach collides: what the most direct approach touched (a branch, wire or post by id, the ground, or an arm link).</param>
public sealed record CutReachability(
    int CutIndex,
    string CutId,
    int LimbGroup,
    IReadOnlyList<CutCandidate> Candidates,
    UnreachableReason? Reason,
    string? Detail,
    double? ShortfallM = null,
    string? BlockedBy = null)
{
    public bool IsReachable => Candidates.Count > 0;
}
