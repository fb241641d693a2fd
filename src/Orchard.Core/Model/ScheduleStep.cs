using Orchard.Core.Timing;

namespace Orchard.Core.Model;

/// <summary>
/// One cut in a schedule: travel from where the arm was to this cut's pre-cut pose, the straight
/// approach to the cut, the cut, and the straight retract back to the pre-cut pose. Seconds are from
/// the schedule's start; the trajectories' own times start at 0 at the start of each phase.
/// </summary>
/// <param name="Sequence">1 for the first cut.</param>
/// <param name="StartSecond">When the travel to this cut begins.</param>
/// <param name="CandidateIndex">Which approach candidate of the cut was chosen.</param>
/// <param name="ApproachAngleRad">Its turn about the branch from the direction facing the arm.</param>
/// <param name="CutConfiguration">Joint values at the cut (joint units).</param>
/// <param name="Travel">Joint trajectory of the travel (knots; constant acceleration between knots).</param>
/// <param name="Approach">Joint trajectory from pre-cut to cut; the retract runs it backwards.</param>
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
    IReadOnlyList<double> PreCutConfiguration,
    IReadOnlyList<double> CutConfiguration,
    string TravelMethod,
    IReadOnlyList<TrajectoryPoint> Travel,
    IReadOnlyList<TrajectoryPoint> Approach)
{
    public double EndSecond => StartSecond + TravelSeconds + ApproachSeconds + CutSeconds + RetractSeconds;
}
