namespace Orchard.Core.Reachability;

/// <summary>What the arm can do about one cut: its usable candidates, or why there are none.</summary>
public sealed record CutReachability(
    int CutIndex,
    string CutId,
    int LimbGroup,
    IReadOnlyList<CutCandidate> Candidates,
    UnreachableReason? Reason,
    string? Detail)
{
    public bool IsReachable => Candidates.Count > 0;
}
