namespace Orchard.Core.Model;

/// <summary>
/// A tree's timed cut schedule: the arm starts at <see cref="StartConfiguration"/>, makes each step's
/// cut in order, then returns to its stow configuration. Versioned: a re-plan after a missed cut
/// makes the next version.
/// </summary>
/// <param name="TotalSeconds">From start to back at stow.</param>
/// <param name="TravelSeconds">Moves between cuts alone (the first travel included, the return to stow not).</param>
/// <param name="ReturnSeconds">The final move back to stow.</param>
public sealed record Schedule(
    string TreeId,
    int Version,
    string ArmProfileId,
    double TotalSeconds,
    double TravelSeconds,
    double ReturnSeconds,
    IReadOnlyList<double> StartConfiguration,
    IReadOnlyList<ScheduleStep> Steps,
    IReadOnlyList<Timing.TrajectoryPoint> ReturnToStow,
    IReadOnlyList<UnscheduledCut> Unscheduled,
    ScheduleStatistics Statistics);
