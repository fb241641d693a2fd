using Orchard.Core.Estimates;

namespace Orchard.Service.Api;

/// <summary>Estimates as JSON: hours for people, intervals as low/high (null when unbounded), undefined rates as null.</summary>
public sealed record EstimatesView(string Model, bool ModelIsGuess, double ConfidenceLevel, double ManualSecondsPerTree, double PlatformSpeedKmh, EstimatesView.Line Orchard, IReadOnlyList<EstimatesView.Line> Blocks, IReadOnlyList<EstimatesView.Line> Rows)
{
    public sealed record Line(
        string Block,
        string? Row,
        int Trees,
        int PlannedTrees,
        int NotPlannedTrees,
        int UnscannedTrees,
        double PlannedHours,
        double PredictedHours,
        double MoveHours,
        double TotalHours,
        double? TotalHoursLow,
        double? TotalHoursHigh,
        double AreaHa,
        double? HoursPerHectare,
        double? TreesPerHour,
        double? CutsPerHour,
        double ManualPersonHours,
        double? RobotHoursPerManualPersonHour);

    public static EstimatesView From(OrchardEstimate estimate)
    {
        ArgumentNullException.ThrowIfNull(estimate);
        return new EstimatesView(
            estimate.Model.Description,
            estimate.Model.IsGuess,
            estimate.Settings.ConfidenceLevel,
            estimate.Settings.ManualSecondsPerTree,
            estimate.Settings.PlatformSpeedKmh,
            LineOf("all", null, estimate.Totals),
            estimate.Blocks.Select(b => LineOf(b.BlockId, null, b.Totals)).ToArray(),
            estimate.Blocks.SelectMany(b => b.Rows).Select(r => LineOf(r.BlockId, r.RowId, r.Totals)).ToArray());
    }

    private static Line LineOf(string block, string? row, EstimateTotals t) => new(
        block, row, t.TreeCount, t.PlannedTrees, t.NotPlannedTrees, t.UnscannedTrees,
        t.PlannedArmSeconds / 3600, Finite(t.PredictedArm.Seconds / 3600) ?? 0, t.MoveSeconds / 3600, t.TotalHours,
        Finite(t.TotalHoursLow), Finite(t.TotalHoursHigh), t.AreaHa,
        Finite(t.HoursPerHectare), Finite(t.TreesPerHour), Finite(t.CutsPerHour), t.ManualPersonHours, Finite(t.RobotHoursPerManualPersonHour));

    private static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;
}
