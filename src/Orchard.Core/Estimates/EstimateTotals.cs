namespace Orchard.Core.Estimates;

/// <summary>
/// Work and time of a row, a block or the orchard. Robot time = arm seconds of the planned trees +
/// predicted arm seconds of the others + platform moves; only the prediction is uncertain, so the
/// interval of the total is the interval of <see cref="PredictedArm"/>. Rates are null where their
/// denominator is zero.
/// </summary>
/// <param name="RowCount">Rows counted.</param>
/// <param name="TreeCount">Trees standing in the rows: planned + not planned + unscanned.</param>
/// <param name="PlannedTrees">Trees with a schedule (finite, non-negative schedule seconds).</param>
/// <param name="NotPlannedTrees">Scanned trees without a schedule yet.</param>
/// <param name="UnscannedTrees">Trees the layout counts but the records do not hold; predicted at the orchard's mean scanned tree.</param>
/// <param name="PlannedArmSeconds">Summed schedule seconds of the planned trees.</param>
/// <param name="PlannedCuts">Scheduled cuts of the planned trees.</param>
/// <param name="UnreachableCuts">Cuts of the planned trees the arm cannot reach (left for hand follow-up).</param>
/// <param name="MootCuts">Cuts of the planned trees made unnecessary by earlier cuts.</param>
/// <param name="PredictedCuts">
/// Expected scheduled cuts of the other trees: their scan cuts times the fraction of scan cuts that
/// planning scheduled on the planned trees (1 when none is planned).
/// </param>
/// <param name="PredictedArm">Predicted arm seconds of the trees not planned, with the interval of their total.</param>
/// <param name="MoveSeconds">Platform travel between trees plus settling at every stop.</param>
/// <param name="AreaHa">Row length × row spacing, summed, in hectares.</param>
/// <param name="ManualPersonHours">Person-hours to prune the same trees by hand at the reference rate.</param>
/// <param name="HandCuts">
/// Cuts left for the hand crew: those of the planned trees, plus for the others their scan cuts times the
/// share of scan cuts the planned trees left (0 while nothing is planned).
/// </param>
/// <param name="HandPersonHours">Person-hours of hand follow-up: <see cref="HandCuts"/> × the hand seconds per cut.</param>
/// <param name="AlleyPasses">Passes of the platform down an alley: one per row, and one more for a row worked from both sides whose trees have far-side stops.</param>
public sealed record EstimateTotals(
    int RowCount,
    int TreeCount,
    int PlannedTrees,
    int NotPlannedTrees,
    int UnscannedTrees,
    double PlannedArmSeconds,
    int PlannedCuts,
    int UnreachableCuts,
    int MootCuts,
    double PredictedCuts,
    TreeTimePrediction PredictedArm,
    double MoveSeconds,
    double AreaHa,
    double ManualPersonHours,
    double HandCuts = 0,
    double HandPersonHours = 0,
    int AlleyPasses = 0)
{
    public const double SecondsPerHour = 3600.0;

    /// <summary>Planned + predicted arm seconds + moves.</summary>
    public double TotalSeconds => PlannedArmSeconds + PredictedArm.Seconds + MoveSeconds;

    public double TotalHours => TotalSeconds / SecondsPerHour;

    /// <summary>Lower end of the interval of the total; the predicted part is not taken below zero.</summary>
    public double TotalHoursLow =>
        (PlannedArmSeconds + MoveSeconds + Math.Max(0.0, PredictedArm.LowerSeconds)) / SecondsPerHour;

    /// <summary>Upper end of the interval of the total; +∞ when the prediction has no interval.</summary>
    public double TotalHoursHigh => (PlannedArmSeconds + MoveSeconds + PredictedArm.UpperSeconds) / SecondsPerHour;

    public double? HoursPerRow => RowCount > 0 ? TotalHours / RowCount : null;

    public double? HoursPerHectare => AreaHa > 0 ? TotalHours / AreaHa : null;

    public double? TreesPerHour => TotalHours > 0 ? TreeCount / TotalHours : null;

    /// <summary>(Planned + predicted cuts) per robot hour.</summary>
    public double? CutsPerHour => TotalHours > 0 ? (PlannedCuts + PredictedCuts) / TotalHours : null;

    /// <summary>Robot hours per person-hour of hand pruning for the same trees (below 1: the robot is quicker than one pruner).</summary>
    public double? RobotHoursPerManualPersonHour => ManualPersonHours > 0 ? TotalHours / ManualPersonHours : null;
}
