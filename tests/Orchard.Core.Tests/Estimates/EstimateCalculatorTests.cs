using Orchard.Core.Estimates;

namespace Orchard.Core.Tests.Estimates;

/// <summary>Hand-computed values on <see cref="EstimateExample"/>.</summary>
public sealed class EstimateCalculatorTests
{
    private const double Tol = 1e-9;

    // Mean scanned tree (for unscanned trees): scan cuts (10 + 20 + 12 + 5 + 8 + 4)/6 = 59/6.
    private const double MeanCuts = 59.0 / 6.0;

    // Fraction of scan cuts scheduled on the planned trees: (9 + 18 + 5 + 7)/(10 + 20 + 5 + 8) = 39/43.
    private const double ScheduledFraction = 39.0 / 43.0;

    private static readonly double Sd = Math.Sqrt(4.75 / 3); // spread of 6, 5, 8, 6 (see TreeTimeModelTests)

    [Fact]
    public void Row_A1_matches_the_hand_computation()
    {
        var estimate = EstimateExample.Compute();
        Assert.Equal(TreeTimeModelKind.SecondsPerCut, estimate.Model.Kind);
        var t = estimate.Model.TQuantile;
        var row = estimate.Blocks[0].Rows[0].Totals;

        Assert.Equal(3, row.TreeCount);
        Assert.Equal(2, row.PlannedTrees);
        Assert.Equal(1, row.NotPlannedTrees);
        Assert.Equal(0, row.UnscannedTrees);
        Assert.Equal(160, row.PlannedArmSeconds, Tol);           // 60 + 100
        Assert.Equal(27, row.PlannedCuts);                         // 9 + 18
        Assert.Equal(2, row.UnreachableCuts);
        Assert.Equal(1, row.MootCuts);
        Assert.Equal(75, row.PredictedArm.Seconds, Tol);           // 6.25 · 12
        // One tree of 12 cuts: t·sd·√(12² + 12²/4).
        Assert.Equal(t * Sd * Math.Sqrt(144 + 36), row.PredictedArm.HalfWidthSeconds, Tol);
        Assert.Equal(9, row.MoveSeconds, Tol);                     // 2 gaps · 1.5 m / 1 m/s + 3 stops · 2 s
        Assert.Equal(244, row.TotalSeconds, Tol);                  // 160 + 75 + 9
        Assert.Equal(244 / 3600.0, row.TotalHours, Tol);
        Assert.Equal(0.035, row.AreaHa, Tol);                      // 100 m · 3.5 m = 350 m²
        Assert.Equal(244 / 3600.0 / 0.035, row.HoursPerHectare!.Value, Tol);
        Assert.Equal(244 / 3600.0, row.HoursPerRow!.Value, Tol);
        Assert.Equal(3 / (244 / 3600.0), row.TreesPerHour!.Value, Tol);
        Assert.Equal((27 + (12 * ScheduledFraction)) / (244 / 3600.0), row.CutsPerHour!.Value, 1e-6);
        Assert.Equal(0.05, row.ManualPersonHours, Tol);            // 3 trees · 60 s
        Assert.Equal(244.0 / 180.0, row.RobotHoursPerManualPersonHour!.Value, Tol);
        Assert.Equal((244 + row.PredictedArm.HalfWidthSeconds) / 3600.0, row.TotalHoursHigh, Tol);
        Assert.Equal((169 + Math.Max(0, 75 - row.PredictedArm.HalfWidthSeconds)) / 3600.0, row.TotalHoursLow, Tol);
    }

    [Fact]
    public void Row_A2_counts_the_unscanned_tree_at_the_mean_scanned_tree()
    {
        var row = EstimateExample.Compute().Blocks[0].Rows[1].Totals;
        Assert.Equal(4, row.TreeCount);
        Assert.Equal(1, row.UnscannedTrees);
        Assert.Equal(88, row.PlannedArmSeconds, Tol);                       // 40 + 48
        Assert.Equal(6.25 * (4 + MeanCuts), row.PredictedArm.Seconds, Tol); // 25 + 61.458…
        Assert.Equal(14, row.MoveSeconds, Tol);                             // 3 gaps · 2 m / 1 m/s + 4 · 2 s
        Assert.Equal(88 + (6.25 * (4 + MeanCuts)) + 14, row.TotalSeconds, Tol);
        Assert.Equal(0.02, row.AreaHa, Tol);                                // 50 m · 4 m
    }

    [Fact]
    public void Block_B_has_only_unscanned_trees()
    {
        var block = EstimateExample.Compute().Blocks[1];
        Assert.Equal("B", block.BlockId);
        var row = Assert.Single(block.Rows).Totals;
        Assert.Equal(2, row.UnscannedTrees);
        Assert.Equal(0, row.PlannedTrees);
        Assert.Equal(2 * 6.25 * MeanCuts, row.PredictedArm.Seconds, Tol);
        Assert.Equal(5, row.MoveSeconds, Tol);                              // 1 m / 1 m/s + 2 · 2 s
        Assert.Equal(row, block.Totals); // a one-row block totals to its row
    }

    [Fact]
    public void Orchard_total_matches_the_hand_computation()
    {
        var estimate = EstimateExample.Compute();
        var total = estimate.Totals;
        var t = estimate.Model.TQuantile;

        Assert.Equal(3, total.RowCount);
        Assert.Equal(9, total.TreeCount);                            // 3 + 4 + 2
        Assert.Equal(4, total.PlannedTrees);
        Assert.Equal(2, total.NotPlannedTrees);
        Assert.Equal(3, total.UnscannedTrees);
        Assert.Equal(248, total.PlannedArmSeconds, Tol);
        Assert.Equal(284.375, total.PredictedArm.Seconds, Tol);      // 6.25 · (12 + 4 + 3 · 59/6) = 6.25 · 45.5
        Assert.Equal(28, total.MoveSeconds, Tol);                    // 9 + 14 + 5
        Assert.Equal(560.375, total.TotalSeconds, Tol);
        Assert.Equal(0.061, total.AreaHa, Tol);                      // 350 + 200 + 60 m²
        Assert.Equal(560.375 / 3600.0 / 3, total.HoursPerRow!.Value, Tol);
        Assert.Equal(560.375 / 540.0, total.RobotHoursPerManualPersonHour!.Value, Tol);
        // Σc = 45.5, Σc² = 144 + 16 + 3·(59/6)²; Var ∝ Σc² + (Σc)²/4.
        var sumSquares = 144 + 16 + (3 * MeanCuts * MeanCuts);
        Assert.Equal(t * Sd * Math.Sqrt(sumSquares + (45.5 * 45.5 / 4)), total.PredictedArm.HalfWidthSeconds, Tol);
    }

    [Fact]
    public void Group_interval_lies_between_quadrature_and_plain_sum_of_row_half_widths()
    {
        // The shared coefficient error correlates the rows positively: wider than independent rows, narrower than fully dependent.
        var estimate = EstimateExample.Compute();
        var rows = estimate.Blocks.SelectMany(b => b.Rows).Select(r => r.Totals.PredictedArm.HalfWidthSeconds).ToArray();
        var total = estimate.Totals.PredictedArm.HalfWidthSeconds;
        Assert.True(total > Math.Sqrt(rows.Sum(h => h * h)));
        Assert.True(total < rows.Sum());
    }

    [Fact]
    public void Block_totals_are_the_sums_of_their_rows()
    {
        var block = EstimateExample.Compute().Blocks[0];
        Assert.Equal(2, block.Totals.RowCount);
        Assert.Equal(7, block.Totals.TreeCount);
        Assert.Equal(block.Rows.Sum(r => r.Totals.TotalSeconds), block.Totals.TotalSeconds, Tol);
        Assert.Equal(block.Rows.Sum(r => r.Totals.AreaHa), block.Totals.AreaHa, Tol);
    }

    [Fact]
    public void Empty_input_gives_zero_totals_undefined_rates_and_a_guess()
    {
        var estimate = EstimateCalculator.Compute([], [], EstimateSettings.Default);
        Assert.Empty(estimate.Blocks);
        Assert.True(estimate.Model.IsGuess);
        Assert.Equal(0, estimate.Totals.TotalSeconds);
        Assert.Equal(0, estimate.Totals.PredictedArm.HalfWidthSeconds);
        Assert.Null(estimate.Totals.HoursPerHectare);
        Assert.Null(estimate.Totals.TreesPerHour);
        Assert.Null(estimate.Totals.HoursPerRow);
        Assert.Null(estimate.Totals.RobotHoursPerManualPersonHour);
    }

    [Fact]
    public void Unplanned_orchard_is_a_guess_with_no_upper_bound()
    {
        var trees = EstimateExample.Trees.Select(t => t with { IsPlanned = false, ScheduleSeconds = null }).ToArray();
        var estimate = EstimateCalculator.Compute(trees, EstimateExample.Rows, EstimateExample.Settings);
        Assert.True(estimate.Model.IsGuess);
        Assert.Equal(8 * (59 + (3 * MeanCuts)), estimate.Totals.PredictedArm.Seconds, Tol); // default 8 s per cut
        Assert.True(double.IsPositiveInfinity(estimate.Totals.TotalHoursHigh));
    }

    [Fact]
    public void Default_units_convert_as_stated()
    {
        var d = EstimateSettings.Default;
        Assert.Equal(0.5 / 3.6, d.PlatformSpeedMPerSecond, Tol);    // 0.5 km/h = 500 m / 3600 s
        Assert.Equal(30, d.ManualTreesPerPersonHour, Tol);          // 3600 s / 120 s
        var row = new RowLayout("X", "1", 1, 4, 100, 2);
        var estimate = EstimateCalculator.Compute([], [row], d);
        // One 1 m gap at 0.5 km/h = 7.2 s, plus 2 stops · 5 s; 100 m · 4 m = 0.04 ha.
        Assert.Equal(7.2 + 10, estimate.Totals.MoveSeconds, Tol);
        Assert.Equal(0.04, estimate.Totals.AreaHa, Tol);
        Assert.Equal(2 * 120 / 3600.0, estimate.Totals.ManualPersonHours, Tol);
    }

    /// <summary>
    /// One row of three trees 2 m apart at 1 m/s, 2 s to settle, 10 s a hand cut. Planned p1 (8 scan cuts,
    /// 2 left for hands, a far-side stop) and p2 (4 scan cuts, none left, near side only); u1 not planned (6
    /// scan cuts). Shares from the planned trees: hand cuts 2 / 12 = 1/6 of scan cuts, far-side stops at 1 of 2 trees.
    /// </summary>
    [Theory]
    [InlineData(true)]
    [InlineData(false)]
    public void Far_side_stops_add_a_pass_down_the_next_alley_and_left_cuts_add_hand_hours(bool bothSides)
    {
        var settings = EstimateSettings.Default with { PlatformSpeedKmh = 3.6, SettleSecondsPerStop = 2, HandSecondsPerCut = 10 };
        var row = new RowLayout("X", "1", InRowSpacingM: 2, RowSpacingM: 4, RowLengthM: 6, TreesInRow: 3, BothSides: bothSides);
        TreeRecord[] trees =
        [
            new("p1", "X", "1", 0, true, 50, 5, 1, 0, 8, 10, 50, FarSideStops: 1, HandCuts: 2),
            new("p2", "X", "1", 1, true, 30, 4, 0, 0, 4, 8, 40),
            new("u1", "X", "1", 2, false, null, 0, 0, 0, 6, 9, 45),
        ];

        var totals = EstimateCalculator.Compute(trees, [row], settings).Totals;

        // Hand cuts 2 + 0 + 6 · 1/6 = 3; 3 · 10 s = 30 s.
        Assert.Equal(3, totals.HandCuts, Tol);
        Assert.Equal(30 / 3600.0, totals.HandPersonHours, Tol);

        // Near pass: 2 gaps · 2 m / 1 m/s + 3 stops · 2 s = 10 s. Far pass (both sides only): 4 s down the next
        // alley + (1 + ½) trees with far-side stops · 2 s = 7 s.
        Assert.Equal(bothSides ? 17 : 10, totals.MoveSeconds, Tol);
        Assert.Equal(bothSides ? 2 : 1, totals.AlleyPasses);
    }

    [Fact]
    public void A_tree_in_a_row_without_layout_or_a_duplicated_row_is_rejected()
    {
        Assert.Throws<ArgumentException>(() =>
            EstimateCalculator.Compute(EstimateExample.Trees, EstimateExample.Rows[1..], EstimateExample.Settings));
        Assert.Throws<ArgumentException>(() =>
            EstimateCalculator.Compute([], [EstimateExample.Rows[0], EstimateExample.Rows[0]], EstimateExample.Settings));
        Assert.Throws<ArgumentOutOfRangeException>(() =>
            EstimateCalculator.Compute([], [], EstimateSettings.Default with { PlatformSpeedKmh = 0 }));
    }
}
