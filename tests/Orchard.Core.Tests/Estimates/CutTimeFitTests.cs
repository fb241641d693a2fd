using Orchard.Core.Estimates;

namespace Orchard.Core.Tests.Estimates;

/// <summary>
/// The measured cut-time line, worked by hand on four cuts: diameters 5, 10, 15, 20 mm taking 1.0, 1.4, 2.0,
/// 2.2 s. d̄ = 12.5, t̄ = 1.65, Sxx = 56.25 + 6.25 + 6.25 + 56.25 = 125, Sxy = 4.875 + 0.625 + 0.875 + 4.125 = 10.5,
/// so b = 10.5 / 125 = 0.084 s/mm and a = 1.65 − 0.084 · 12.5 = 0.6 s. Fitted 1.02, 1.44, 1.86, 2.28; residuals
/// −0.02, −0.04, 0.14, −0.08; SSE = 0.028, s² = 0.028 / 2 = 0.014.
/// </summary>
public sealed class CutTimeFitTests
{
    private static readonly (double, double)[] FourCuts = [(5, 1.0), (10, 1.4), (15, 2.0), (20, 2.2)];

    private static readonly CutTimeFitSettings FourEnough = new(MinimumCuts: 4);

    [Fact]
    public void Four_measured_cuts_give_the_hand_computed_line_and_intervals()
    {
        var fit = CutTimeFit.Fit("A", FourCuts, FourEnough);

        Assert.Equal(CutTimeSource.Measured, fit.Source);
        Assert.Equal(4, fit.SampleCount);
        Assert.Equal(0.6, fit.InterceptSeconds, 1e-12);
        Assert.Equal(0.084, fit.SecondsPerMm, 1e-12);
        var s = Math.Sqrt(0.014);
        Assert.Equal(s, fit.ResidualStandardErrorSeconds, 1e-12);
        Assert.Equal(s / Math.Sqrt(125), fit.SlopeStandardError, 1e-12);                      // s / √Sxx
        Assert.Equal(s * Math.Sqrt((1.0 / 4) + (12.5 * 12.5 / 125)), fit.InterceptStandardError, 1e-12); // s·√(1/n + d̄²/Sxx) = s·√1.5

        // t(0.975, 2 dof) = 4.303 in printed Student t tables (recalled from the standard table).
        Assert.Equal(4.303, fit.TQuantile, 3);
        Assert.Equal(fit.TQuantile * s * Math.Sqrt(1 + 0.25 + (7.5 * 7.5 / 125)), fit.PredictionHalfWidthSeconds(20), 1e-12);
        Assert.Equal(0.6 + (0.084 * 20), fit.PredictSeconds(20), 1e-12);
        Assert.Contains("least squares on 4 measured cuts", fit.Description, StringComparison.Ordinal);
    }

    [Fact]
    public void Measured_cut_times_change_the_planned_seconds_of_the_block()
    {
        // A planned tree of 10 cuts, 100 s in all, of which 20 s are its cuts as planned; its cuts' diameters sum to 120 mm.
        // Measured: 10 · 0.6 + 0.084 · 120 = 16.08 s of cutting, so 100 − 20 + 16.08 = 96.08 s.
        TreeRecord[] trees = [new("t1", "A", "1", 0, true, 100, 10, 0, 0, 10, 20, 100, PlannedCutSeconds: 20, CutDiameterSumMm: 120)];
        RowLayout[] rows = [new("A", "1", 1, 3, 10, 1)];
        var fits = new Dictionary<string, CutTimeFit> { ["A"] = CutTimeFit.Fit("A", FourCuts, FourEnough) };

        var learned = EstimateCalculator.Compute(trees, rows, EstimateSettings.Default, fits);
        var planned = EstimateCalculator.Compute(trees, rows, EstimateSettings.Default);

        Assert.Equal(96.08, learned.Totals.PlannedArmSeconds, 1e-9);
        Assert.Equal(100, planned.Totals.PlannedArmSeconds, 1e-12);
        Assert.Equal(100 - 96.08, planned.Totals.TotalSeconds - learned.Totals.TotalSeconds, 1e-9);
    }

    [Fact]
    public void Too_few_measured_cuts_keep_the_arm_profiles_model_and_say_so()
    {
        var fit = CutTimeFit.Fit("A", FourCuts[..3]);

        Assert.Equal(CutTimeSource.ArmProfile, fit.Source);
        Assert.Equal(3, fit.SampleCount);
        Assert.Equal("Block A: 3 measured cuts, fewer than the 20 needed; the arm profile's cut-time model (as planned) is used.", fit.Description);

        TreeRecord[] trees = [new("t1", "A", "1", 0, true, 100, 10, 0, 0, 10, 20, 100, PlannedCutSeconds: 20, CutDiameterSumMm: 120)];
        var estimate = EstimateCalculator.Compute(trees, [new RowLayout("A", "1", 1, 3, 10, 1)], EstimateSettings.Default, new Dictionary<string, CutTimeFit> { ["A"] = fit });
        Assert.Equal(100, estimate.Totals.PlannedArmSeconds, 1e-12);
    }

    [Fact]
    public void Cuts_all_of_one_diameter_have_no_slope_and_keep_the_arm_profiles_model()
    {
        var fit = CutTimeFit.Fit("B", Enumerable.Range(0, 25).Select(i => (12.0 + (0.05 * (i % 3)), 1.0 + (0.01 * i))));

        Assert.Equal(CutTimeSource.ArmProfile, fit.Source);
        Assert.Contains("spread less than 2 mm", fit.Description, StringComparison.Ordinal);
    }

    [Fact]
    public void Unusable_measurements_are_left_out_of_the_count()
    {
        var fit = CutTimeFit.Fit("A", [.. FourCuts, (double.NaN, 1.0), (10, -1.0), (10, double.PositiveInfinity)], FourEnough);

        Assert.Equal(4, fit.SampleCount);
        Assert.Equal(0.084, fit.SecondsPerMm, 1e-12);
    }
}
