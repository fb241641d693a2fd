using Orchard.Core.Timing;

namespace Orchard.Core.Model;

/// <summary>
/// One cut in a schedule: travel from the previous clear pose (or the stop's start) to this cut's clear
/// pose, the straight approach in along the approach axis through the pre-cut pose to the cut, the cut,
/// and the straight retract back out to the clear pose. Seconds are from the schedule's start; the
/// trajectories' own times start at 0 at the start of each phase.
/// </summary>
/// <param name="Sequence">1 for the first cut of the schedule (numbering runs on across stops).</param>
/// <param name="StartSecond">When the travel to this cut begins.</param>
/// <param name="CandidateIndex">Which approach candidate of the cut was chosen.</param>
/// <param name="ApproachAngleRad">Its turn about the branch from the direction facing the arm.</param>
/// <param name="ClearConfiguration">Backed out along the approach until clear of the wood: where travel ends and the retract returns to (joint units).</param>
/// <param name="PreCutConfiguration">The stand-off pose on the approach, where the shear slows for the last part.</param>
/// <param name="CutConfiguration">Joint values at the cut.</param>
/// <param name="Travel">Joint trajectory of the travel.</param>
/// <param name="Approach">Joint trajectory from the clear pose to the cut; the retract runs it backwards (same knots, times mirrored, velocities negated).</param>
/// <param name="PreCutSecond">The time on the approach from which it runs inside the pre-cut pose, at the reduced speed: from there on (and on the retract until the mirrored time) the shear may touch the limb being cut, nothing else.</param>
/// <param name="DependsOnCuts">Cuts whose wood must be gone for the travel to be free (planned through the space they free); empty when planned against the whole tree.</param>
public sealed record ScheduleStep(
    int Sequence,
    string CutId,
    double StartSecond,
    double TravelSeconds,
    double ApproachSeconds,
    double CutSeconds,
    double RetractSeconds,
    int CandidateIndex,
    double ApproachAngleRad,
    IReadOnlyList<double> ClearConfiguration,
    IReadOnlyList<double> PreCutConfiguration,
    IReadOnlyList<double> CutConfiguration,
    string TravelMethod,
    IReadOnlyList<TrajectoryPoint> Travel,
    IReadOnlyList<TrajectoryPoint> Approach,
    double PreCutSecond,
    IReadOnlyList<string> DependsOnCuts)
{
    public double EndSecond => StartSecond + TravelSeconds + ApproachSeconds + CutSeconds + RetractSeconds;
}
