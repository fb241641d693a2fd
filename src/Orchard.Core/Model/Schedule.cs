using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>
/// A tree's timed cut schedule: an ordered list of stops of the platform. At each stop the arm starts
/// stowed (the first stop of a re-plan: where the arm was, with a checked retreat first), makes its
/// steps' cuts in order and returns to stow; then the platform moves on to the next stop. Stops on the
/// far side of the row are worked from the next alley, on the platform's pass down it.
/// Versioned: the store assigns the version when it commits the schedule.
/// </summary>
/// <param name="ScanId">The stored scan this schedule was planned from (set by the service; empty offline).</param>
/// <param name="ReplansVersion">For a re-plan, the version it replaces; null for a plan of a new scan.</param>
/// <param name="Status">Whether planning finished, stopped early, or scheduled nothing.</param>
/// <param name="TotalSeconds">Arm seconds and platform seconds of every stop, both sides.</param>
/// <param name="ArmSeconds">The arm's work at every stop: travel, approaches, cuts, retracts and returns to stow.</param>
/// <param name="PlatformSeconds">Platform moves between stops on the same side, settle times included.</param>
/// <param name="Problems">What stopped or limited planning at the tree level (a start that is not free, a deadline), with what to do.</param>
public sealed record Schedule(
    string TreeId,
    int Version,
    string ScanId,
    int? ReplansVersion,
    string ArmProfileId,
    ScheduleStatus Status,
    double TotalSeconds,
    double ArmSeconds,
    double PlatformSeconds,
    IReadOnlyList<ScheduleStop> Stops,
    IReadOnlyList<UnscheduledCut> Unscheduled,
    IReadOnlyList<TreeProblem> Problems,
    ScheduleStatistics Statistics)
{
    /// <summary>Every step of every stop, in the order the cuts are made.</summary>
    public IEnumerable<ScheduleStep> AllSteps() => Stops.SelectMany(s => s.Steps);

    /// <summary>Number of cuts scheduled, over all stops.</summary>
    [JsonIgnore]
    public int StepCount => Stops.Sum(s => s.Steps.Count);

    /// <summary>Travel between cuts over all stops (not the returns to stow).</summary>
    [JsonIgnore]
    public double TravelSeconds => AllSteps().Sum(s => s.TravelSeconds);

    /// <summary>Returns to stow over all stops.</summary>
    [JsonIgnore]
    public double ReturnSeconds => Stops.Sum(s => s.ReturnSeconds);
}
