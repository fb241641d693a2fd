using Orchard.Core.Model;

namespace Orchard.Core.Estimates;

/// <summary>
/// What the estimates need of a tree's current schedule, worked out once when the plan is written. The
/// diameter sums let a cut-time model t(d) = a + b·d + c·d² be re-applied to the scheduled cuts without the
/// schedule: Σ t(dᵢ) = n·a + b·Σdᵢ + c·Σdᵢ².
/// </summary>
/// <param name="TotalSeconds">The schedule's seconds, arm and platform, every stop.</param>
/// <param name="ScheduledCuts">Steps of the schedule.</param>
/// <param name="UnreachableCuts">Cuts no stop could reach.</param>
/// <param name="MootCuts">Cuts whose wood another cut removes.</param>
/// <param name="HandCuts">Cuts left for a person: unreachable, dropped, or not planned before a deadline.</param>
/// <param name="FarSideStops">Stops worked from the alley on the far side of the row.</param>
/// <param name="CutSeconds">Shear seconds of the scheduled cuts as planned (from the arm profile's cut-time model).</param>
/// <param name="DiameterSumMm">Σ of the scheduled cuts' diameters, millimetres.</param>
/// <param name="DiameterSquareSumMm2">Σ of their squares, mm².</param>
public sealed record ScheduleFeatures(
    double TotalSeconds,
    int ScheduledCuts,
    int UnreachableCuts,
    int MootCuts,
    int HandCuts,
    int FarSideStops,
    double CutSeconds,
    double DiameterSumMm,
    double DiameterSquareSumMm2)
{
    /// <summary>The features of <paramref name="schedule"/>; diameters come from <paramref name="scan"/> (the scan it was planned from), 0 for cuts it lacks.</summary>
    public static ScheduleFeatures Of(Schedule schedule, TreeScan? scan)
    {
        ArgumentNullException.ThrowIfNull(schedule);
        var diameters = new Dictionary<string, double>(StringComparer.Ordinal);
        foreach (var cut in scan?.Cuts ?? [])
        {
            diameters[cut.Id] = cut.DiameterMm;
        }

        double sum = 0, squares = 0, cutSeconds = 0;
        var steps = 0;
        foreach (var step in schedule.AllSteps())
        {
            var d = diameters.GetValueOrDefault(step.CutId);
            sum += d;
            squares += d * d;
            cutSeconds += step.CutSeconds;
            steps++;
        }

        return new ScheduleFeatures(
            schedule.TotalSeconds,
            steps,
            schedule.Unscheduled.Count(u => u.Status == UnscheduledStatus.Unreachable),
            schedule.Unscheduled.Count(u => u.Status == UnscheduledStatus.Moot),
            schedule.Unscheduled.Count(u => u.Status is UnscheduledStatus.Unreachable or UnscheduledStatus.Dropped or UnscheduledStatus.NotPlanned),
            schedule.Stops.Count(s => s.Side == StopSide.Far),
            cutSeconds,
            sum,
            squares);
    }
}
