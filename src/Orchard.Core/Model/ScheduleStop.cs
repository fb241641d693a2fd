using Orchard.Core.Timing;

namespace Orchard.Core.Model;

/// <summary>
/// One stop of the platform at a tree: where the arm base stands, the cuts made from there, and the
/// arm's return to stow before the platform moves on. Seconds are from the schedule's start.
/// </summary>
/// <param name="Sequence">1 for the first stop.</param>
/// <param name="Side">The alley it is worked from.</param>
/// <param name="ArmBase">Where the arm base stands, in the tree frame.</param>
/// <param name="AlongRowOffsetM">Its offset from the tablet's stand along the row (tree frame x).</param>
/// <param name="IntoAlleyOffsetM">Its offset from the stand line of its side, away from the row (positive: further into the alley).</param>
/// <param name="PlatformMoveSeconds">Moving the platform here from the previous stop of the same side and settling; 0 for the first stop of a side.</param>
/// <param name="StartSecond">When the arm starts working here.</param>
/// <param name="StartConfiguration">Joint values when the arm starts here: stowed, or for a re-plan's first stop where the arm was reported.</param>
/// <param name="Retreat">For a re-plan's first stop: the checked move out of the reported configuration to a clear one (empty when none was needed).</param>
/// <param name="ReturnMethod">How the return to stow was planned; <c>none</c> when no move back was found (the schedule's problems say so).</param>
/// <param name="ReturnDependsOnCuts">Cuts whose wood must be gone for the return to be free (planned through the space they free).</param>
public sealed record ScheduleStop(
    int Sequence,
    StopSide Side,
    ArmBasePose ArmBase,
    double AlongRowOffsetM,
    double IntoAlleyOffsetM,
    double PlatformMoveSeconds,
    double StartSecond,
    IReadOnlyList<double> StartConfiguration,
    double RetreatSeconds,
    IReadOnlyList<TrajectoryPoint> Retreat,
    IReadOnlyList<ScheduleStep> Steps,
    double ReturnSeconds,
    string ReturnMethod,
    IReadOnlyList<TrajectoryPoint> ReturnToStow,
    IReadOnlyList<string> ReturnDependsOnCuts)
{
    /// <summary>When the arm is back at stow here.</summary>
    public double EndSecond => Steps.Count == 0 ? StartSecond + RetreatSeconds + ReturnSeconds : Steps[^1].EndSecond + ReturnSeconds;
}
