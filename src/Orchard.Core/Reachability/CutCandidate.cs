using System.Text.Json.Serialization;

namespace Orchard.Core.Reachability;

/// <summary>
/// One usable way to make a cut: an approach direction and jaw orientation, and the joint solution for
/// it. The arm arrives at <see cref="ClearConfiguration"/> (backed out along the approach until clear of
/// the wood), moves straight in along the approach through <see cref="PreCutConfiguration"/> (the
/// stand-off) to <see cref="CutConfiguration"/>, cuts, and retracts the same way back to the clear pose.
/// Moves between cuts are planned between clear poses.
/// </summary>
/// <param name="CutIndex">Index of the cut in the scan.</param>
/// <param name="ApproachAngleRad">Turn about the branch from the direction facing the arm.</param>
/// <param name="JawsFlipped">The shear is turned half a turn about the approach.</param>
/// <param name="ApproachPath">Joint configurations from the clear pose (first) through the pre-cut pose to the cut (last), each edge checked.</param>
/// <param name="ApproachStationsM">For each configuration of the path, the TCP's distance along the approach from the clear pose (0 first, increasing).</param>
/// <param name="PreCutIndex">Index of the pre-cut configuration in the path.</param>
/// <param name="ClearanceM">Clearance of the clear configuration to the scene and the ground (wood, trellis, ground).</param>
public sealed record CutCandidate(
    int CutIndex,
    int CandidateIndex,
    double ApproachAngleRad,
    bool JawsFlipped,
    IReadOnlyList<double[]> ApproachPath,
    IReadOnlyList<double> ApproachStationsM,
    int PreCutIndex,
    double ClearanceM)
{
    [JsonIgnore]
    public IReadOnlyList<double> ClearConfiguration => ApproachPath[0];

    [JsonIgnore]
    public IReadOnlyList<double> PreCutConfiguration => ApproachPath[PreCutIndex];

    [JsonIgnore]
    public IReadOnlyList<double> CutConfiguration => ApproachPath[^1];

    /// <summary>Length of the straight approach from the clear pose to the cut, metres.</summary>
    [JsonIgnore]
    public double ApproachDistanceM => ApproachStationsM[^1];
}
