namespace Orchard.Core.Reachability;

/// <summary>
/// One usable way to make a cut: an approach direction and jaw orientation, and the joint solution for
/// it. The arm arrives at <see cref="PreCutConfiguration"/> (the stand-off back along the approach),
/// moves straight in through <see cref="ApproachPath"/> to <see cref="CutConfiguration"/>, cuts, and
/// retracts the same way.
/// </summary>
/// <param name="CutIndex">Index of the cut in the scan.</param>
/// <param name="ApproachAngleRad">Turn about the branch from the direction facing the arm.</param>
/// <param name="JawsFlipped">The shear is turned half a turn about the approach.</param>
/// <param name="ApproachPath">Joint configurations from pre-cut (first) to cut (last), each edge checked.</param>
/// <param name="ClearanceM">Smallest clearance of the pre-cut configuration to anything.</param>
public sealed record CutCandidate(
    int CutIndex,
    int CandidateIndex,
    double ApproachAngleRad,
    bool JawsFlipped,
    IReadOnlyList<double> PreCutConfiguration,
    IReadOnlyList<double> CutConfiguration,
    IReadOnlyList<double[]> ApproachPath,
    double ClearanceM);
