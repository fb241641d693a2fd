namespace Orchard.Core.Model;

/// <summary>
/// A cut left out of a schedule and why, in terms a person can act on: which stop came nearest, by how
/// much the shear fell short, what blocked it, so the tablet user can move the platform or leave the cut
/// to the hand crew.
/// </summary>
/// <param name="RemovedBy">For moot cuts, the cut that removes this one's wood.</param>
/// <param name="NearestStop">The stop (its sequence) that came nearest to making the cut; null when there is none.</param>
/// <param name="ShortfallMm">How far the shear stayed from the cut pose from that stop, when out of reach.</param>
/// <param name="BlockedBy">What blocked the approach or the move from there: a branch, wire or post of the scan, the ground, or an arm link.</param>
public sealed record UnscheduledCut(
    string CutId,
    UnscheduledStatus Status,
    UnscheduledReason? Reason,
    string Detail,
    string? RemovedBy = null,
    int? NearestStop = null,
    double? ShortfallMm = null,
    string? BlockedBy = null);
