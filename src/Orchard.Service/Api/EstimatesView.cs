using Orchard.Core.Estimates;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>
/// Estimates as JSON: hours for people, intervals as low/high (null when unbounded), undefined rates as
/// null; per line the hand follow-up and the controller's progress (cuts done, missed and skipped, re-plans
/// written) on the trees' latest scans.
/// </summary>
/// <param name="Model">Which tree-time model the predictions used, in words.</param>
/// <param name="FeaturesRefreshed">Trees whose stored features had to be worked out again for this answer (0 once every scan and plan has been recorded).</param>
/// <param name="CutTimeModels">Per block: which cut-time model the planned seconds were counted with, measured or the arm profile's, and why.</param>
public sealed record EstimatesView(
    string Model,
    bool ModelIsGuess,
    double ConfidenceLevel,
    double ManualSecondsPerTree,
    double PlatformSpeedKmh,
    double HandSecondsPerCut,
    int FeaturesRefreshed,
    IReadOnlyList<EstimatesView.BlockCutTimes> CutTimeModels,
    EstimatesView.Line Orchard,
    IReadOnlyList<EstimatesView.Line> Blocks,
    IReadOnlyList<EstimatesView.Line> Rows)
{
    /// <param name="Registered">The row (every row, for a block or the orchard) is in the row registry; false means a stand-in layout.</param>
    /// <param name="HandCuts">Cuts left for the hand crew (planned trees as planned, the rest at the planned trees' share).</param>
    /// <param name="HandPersonHours">Hand follow-up: hand cuts × the hand seconds per cut.</param>
    /// <param name="AlleyPasses">Passes of the platform down an alley (a second one for far-side stops).</param>
    public sealed record Line(
        string Block,
        string? Row,
        bool Registered,
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
        double? RobotHoursPerManualPersonHour,
        int PlannedCuts,
        int UnreachableCuts,
        double HandCuts,
        double HandPersonHours,
        int AlleyPasses,
        int CutsDone,
        int CutsMissed,
        int CutsSkipped,
        int Replans);

    /// <summary>A block's cut-time model: <c>measured</c> (a line through the controller's measured durations) or <c>armProfile</c>.</summary>
    /// <param name="InterceptSeconds">a of seconds = a + b·diameter mm; null unless measured.</param>
    /// <param name="SecondsPerMm">b; null unless measured.</param>
    /// <param name="SecondsPerMmLow">Lower end of b's confidence interval at <see cref="ConfidenceLevel"/>; null unless measured.</param>
    /// <param name="SecondsPerMmHigh">Upper end.</param>
    public sealed record BlockCutTimes(
        string Block,
        CutTimeSource Source,
        int MeasuredCuts,
        double? InterceptSeconds,
        double? SecondsPerMm,
        double? SecondsPerMmLow,
        double? SecondsPerMmHigh,
        double? ResidualStandardErrorSeconds,
        double ConfidenceLevel,
        string Description);

    public static EstimatesView From(OrchardEstimate estimate, EstimateInputs inputs)
    {
        ArgumentNullException.ThrowIfNull(estimate);
        ArgumentNullException.ThrowIfNull(inputs);
        var rowOf = inputs.Trees.ToDictionary(t => t.TreeId, t => (t.BlockId, t.RowId), StringComparer.Ordinal);
        var progress = new Dictionary<(string Block, string Row), Progress>();
        foreach (var tally in inputs.Progress)
        {
            if (rowOf.TryGetValue(tally.TreeId, out var key))
            {
                progress[key] = progress.GetValueOrDefault(key) + new Progress(tally.CutsDone, tally.CutsMissed, tally.CutsSkipped, tally.Replans);
            }
        }

        Progress Sum(Func<(string Block, string Row), bool> which) =>
            progress.Where(p => which(p.Key)).Aggregate(default(Progress), (a, p) => a + p.Value);
        bool Registered(Func<(string Block, string Row), bool> which) =>
            !inputs.UnregisteredRows.Any(which);

        var rows = estimate.Blocks.SelectMany(b => b.Rows)
            .Select(r => LineOf(r.BlockId, r.RowId, r.Totals, !inputs.UnregisteredRows.Contains((r.BlockId, r.RowId)), progress.GetValueOrDefault((r.BlockId, r.RowId))))
            .ToArray();
        var blocks = estimate.Blocks
            .Select(b => LineOf(b.BlockId, null, b.Totals, Registered(k => k.Block == b.BlockId), Sum(k => k.Block == b.BlockId)))
            .ToArray();
        return new EstimatesView(
            estimate.Model.Description,
            estimate.Model.IsGuess,
            estimate.Settings.ConfidenceLevel,
            estimate.Settings.ManualSecondsPerTree,
            estimate.Settings.PlatformSpeedKmh,
            estimate.Settings.HandSecondsPerCut,
            inputs.FeaturesRefreshed,
            inputs.CutTimes.Values.OrderBy(f => f.Block, StringComparer.Ordinal).Select(ModelOf).ToArray(),
            LineOf("all", null, estimate.Totals, inputs.UnregisteredRows.Count == 0, Sum(_ => true)),
            blocks,
            rows);
    }

    private static Line LineOf(string block, string? row, EstimateTotals t, bool registered, Progress p) => new(
        block, row, registered, t.TreeCount, t.PlannedTrees, t.NotPlannedTrees, t.UnscannedTrees,
        t.PlannedArmSeconds / 3600, Finite(t.PredictedArm.Seconds / 3600) ?? 0, t.MoveSeconds / 3600, t.TotalHours,
        Finite(t.TotalHoursLow), Finite(t.TotalHoursHigh), t.AreaHa,
        Finite(t.HoursPerHectare), Finite(t.TreesPerHour), Finite(t.CutsPerHour), t.ManualPersonHours, Finite(t.RobotHoursPerManualPersonHour),
        t.PlannedCuts, t.UnreachableCuts, t.HandCuts, t.HandPersonHours, t.AlleyPasses,
        p.Done, p.Missed, p.Skipped, p.Replans);

    private static BlockCutTimes ModelOf(CutTimeFit fit)
    {
        var measured = fit.Source == CutTimeSource.Measured;
        return new BlockCutTimes(
            fit.Block,
            fit.Source,
            fit.SampleCount,
            measured ? fit.InterceptSeconds : null,
            measured ? fit.SecondsPerMm : null,
            measured ? fit.SecondsPerMm - (fit.TQuantile * fit.SlopeStandardError) : null,
            measured ? fit.SecondsPerMm + (fit.TQuantile * fit.SlopeStandardError) : null,
            measured ? fit.ResidualStandardErrorSeconds : null,
            fit.ConfidenceLevel,
            fit.Description);
    }

    private static double? Finite(double? value) => value is { } v && double.IsFinite(v) ? v : null;

    /// <summary>Outcome counts summed over trees.</summary>
    private readonly record struct Progress(int Done, int Missed, int Skipped, int Replans)
    {
        public static Progress operator +(Progress a, Progress b) => new(a.Done + b.Done, a.Missed + b.Missed, a.Skipped + b.Skipped, a.Replans + b.Replans);
    }
}
