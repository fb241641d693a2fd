using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearAlgebra;
using Orchard.Core.Estimates;

namespace Orchard.Core.Tests.Estimates;

public sealed class TreeTimeModelTests
{
    private static readonly EstimateSettings Settings = EstimateSettings.Default;

    /// <summary>
    /// NIST Statistical Reference Datasets, linear least squares, "Pontius" (Pontius, P., NIST, load cell
    /// calibration; https://www.itl.nist.gov/div898/strd/lls/data/Pontius.shtml), model
    /// y = B0 + B1·x + B2·x², 40 observations. Data and certified values transcribed from the NIST file as
    /// reproduced in two independent public test suites (an Octave wpolyfit test and a Java regression
    /// test), which agree digit for digit. Fed as cuts = x, size = x².
    /// </summary>
    [Fact]
    public void Pontius_certified_coefficients_standard_errors_and_residual_sd_are_reproduced()
    {
        double[] y =
        [
            .11019, .21956, .32949, .43899, .54803, .65694, .76562, .87487, .98292, 1.09146,
            1.20001, 1.30822, 1.41599, 1.52399, 1.63194, 1.73947, 1.84646, 1.95392, 2.06128, 2.16844,
            .11052, .22018, .32939, .43886, .54798, .65739, .76596, .87474, .98300, 1.09150,
            1.20004, 1.30818, 1.41613, 1.52408, 1.63159, 1.73965, 1.84696, 1.95445, 2.06177, 2.16829,
        ];
        var x = Enumerable.Range(0, 40).Select(i => 150000.0 * ((i % 20) + 1)).ToArray();
        var model = TreeTimeModel.FitObservations(x, x.Select(v => v * v).ToArray(), y, Settings);

        Assert.Equal(TreeTimeModelKind.LeastSquares, model.Kind);
        Assert.Equal(37, model.DegreesOfFreedom);
        AssertRelative(0.673565789473684E-03, model.Coefficients[0], 1e-8);
        AssertRelative(0.732059160401003E-06, model.Coefficients[1], 1e-8);
        AssertRelative(-0.316081871345029E-14, model.Coefficients[2], 1e-8);
        AssertRelative(0.107938612033077E-03, model.CoefficientStandardErrors[0], 1e-7);
        AssertRelative(0.157817399981659E-09, model.CoefficientStandardErrors[1], 1e-7);
        AssertRelative(0.486652849992036E-16, model.CoefficientStandardErrors[2], 1e-7);
        AssertRelative(0.205177424076185E-03, model.ResidualStandardErrorSeconds, 1e-8);
    }

    [Fact]
    public void Planned_trees_with_nothing_scheduled_are_left_out_of_the_fit_and_said_so()
    {
        // Six trees on seconds = 12 + 4.5·cuts + 0.8·size exactly, and two planned trees whose schedules make no
        // cut (0 s). Left out, the fit is the exact line.
        TreeRecord Tree(int i, int cuts, double size, bool nothing = false) => new(
            $"t{i}", "B", "R", i, true, nothing ? 0 : 12 + (4.5 * cuts) + (0.8 * size), nothing ? 0 : cuts, nothing ? cuts : 0, 0, cuts, size, 10);
        var trees = new[]
        {
            Tree(1, 10, 20), Tree(2, 14, 25), Tree(3, 8, 18), Tree(4, 20, 30), Tree(5, 12, 40), Tree(6, 16, 22),
            Tree(7, 18, 30, nothing: true), Tree(8, 15, 26, nothing: true),
        };
        var model = TreeTimeModel.Fit(trees, Settings);
        Assert.Equal(TreeTimeModelKind.LeastSquares, model.Kind);
        Assert.Equal(6, model.SampleCount);
        Assert.Equal(2, model.LeftOutNothingScheduled);
        Assert.Equal(12, model.Coefficients[0], 9);
        Assert.Equal(4.5, model.Coefficients[1], 9);
        Assert.Equal(0.8, model.Coefficients[2], 9);
        Assert.Contains("2 planned tree(s) with nothing scheduled were left out", model.Description, StringComparison.Ordinal);

        // Fitted with them the line is wrecked: seconds per cut turns negative (−0.24 s, computed by hand from the
        // normal equations), which is what leaving them out prevents.
        var withThem = TreeTimeModel.FitObservations(trees.Select(t => (double)t.ScanCutCount).ToArray(), trees.Select(t => t.TotalBranchLengthM).ToArray(), trees.Select(t => t.ScheduleSeconds!.Value).ToArray(), Settings);
        Assert.Equal(-0.2394, withThem.Coefficients[1], 3);
    }

    [Fact]
    public void Data_without_noise_recovers_the_generating_coefficients_and_a_zero_width_interval()
    {
        // seconds = 12 + 4.5·cuts + 0.8·size exactly.
        double[] cuts = [3, 10, 7, 15, 22, 9, 30, 4];
        double[] sizes = [8, 25, 40, 12, 30, 55, 18, 70];
        var seconds = cuts.Zip(sizes, (c, s) => 12 + (4.5 * c) + (0.8 * s)).ToArray();
        var model = TreeTimeModel.FitObservations(cuts, sizes, seconds, Settings);

        Assert.Equal(TreeTimeModelKind.LeastSquares, model.Kind);
        Assert.Equal(12, model.Coefficients[0], 1e-9);
        Assert.Equal(4.5, model.Coefficients[1], 1e-9);
        Assert.Equal(0.8, model.Coefficients[2], 1e-9);
        var p = model.Predict(new TreeFeatures(20, 50));
        Assert.Equal(12 + 90 + 40, p.Seconds, 1e-8);
        Assert.Equal(0, p.HalfWidthSeconds, 1e-6);
    }

    /// <summary>
    /// Derived by hand. With u = cuts − 10 and v = size − 20 the five points (u, v) = (−1,0), (1,0),
    /// (0,−1), (0,1), (0,0) are centred and orthogonal, so in the (1, u, v) basis XᵀX = diag(5, 2, 2).
    /// y = 10, 14, 11, 15, 12: mean 62/5 = 12.4; b_u = (14 − 10)/2 = 2; b_v = (15 − 11)/2 = 2;
    /// b0 = 12.4 − 2·10 − 2·20 = −47.6. Fitted 10.4, 14.4, 10.4, 14.4, 12.4; residuals −0.4, −0.4, 0.6,
    /// 0.6, −0.4; RSS = 3·0.16 + 2·0.36 = 1.2; dof 2; s² = 0.6; SE(b1) = SE(b2) = √(0.6/2) = √0.3.
    /// t(0.975, 2) has the closed form (2p − 1)/√(2p(1 − p)) = 0.95/√0.04875 for 2 degrees of freedom.
    /// At the centre x₀ᵀ(XᵀX)⁻¹x₀ = 1/5: half-width t·√(0.6·1.2); at (u, v) = (1, 1) it is 1/5 + 1/2 + 1/2 = 1.2:
    /// prediction 16.4, half-width t·√(0.6·2.2).
    /// </summary>
    [Fact]
    public void Small_orthogonal_design_matches_the_hand_derived_fit_and_interval()
    {
        double[] cuts = [9, 11, 10, 10, 10];
        double[] sizes = [20, 20, 19, 21, 20];
        double[] seconds = [10, 14, 11, 15, 12];
        var model = TreeTimeModel.FitObservations(cuts, sizes, seconds, Settings);

        Assert.Equal(TreeTimeModelKind.LeastSquares, model.Kind);
        Assert.Equal(-47.6, model.Coefficients[0], 1e-9);
        Assert.Equal(2, model.Coefficients[1], 1e-9);
        Assert.Equal(2, model.Coefficients[2], 1e-9);
        Assert.Equal(Math.Sqrt(0.6), model.ResidualStandardErrorSeconds, 1e-12);
        Assert.Equal(Math.Sqrt(0.3), model.CoefficientStandardErrors[1], 1e-12);
        Assert.Equal(Math.Sqrt(0.3), model.CoefficientStandardErrors[2], 1e-12);

        var t = 0.95 / Math.Sqrt(0.04875);
        Assert.Equal(t, model.TQuantile, 1e-9);
        var centre = model.Predict(new TreeFeatures(10, 20));
        Assert.Equal(12.4, centre.Seconds, 1e-9);
        Assert.Equal(t * Math.Sqrt(0.6 * 1.2), centre.HalfWidthSeconds, 1e-9);
        var corner = model.Predict(new TreeFeatures(11, 21));
        Assert.Equal(16.4, corner.Seconds, 1e-9);
        Assert.Equal(t * Math.Sqrt(0.6 * 2.2), corner.HalfWidthSeconds, 1e-9);
    }

    [Fact]
    public void Fit_and_interval_agree_with_MathNet_normal_equations_and_a_direct_matrix_computation()
    {
        var rng = new Random(7);
        var n = 25;
        var cuts = Enumerable.Range(0, n).Select(_ => (double)rng.Next(2, 40)).ToArray();
        var sizes = Enumerable.Range(0, n).Select(_ => 5 + (60 * rng.NextDouble())).ToArray();
        var seconds = cuts.Zip(sizes, (c, s) => 15 + (5 * c) + (0.6 * s) + (8 * (rng.NextDouble() - 0.5))).ToArray();
        var model = TreeTimeModel.FitObservations(cuts, sizes, seconds, Settings);

        var x = Matrix<double>.Build.Dense(n, 3, (i, j) => j == 0 ? 1 : j == 1 ? cuts[i] : sizes[i]);
        var y = Vector<double>.Build.DenseOfArray(seconds);
        var reference = MathNet.Numerics.LinearRegression.MultipleRegression.NormalEquations(x, y);
        for (var j = 0; j < 3; j++)
        {
            Assert.Equal(reference[j], model.Coefficients[j], 1e-8);
        }

        var xtxInverse = (x.Transpose() * x).Inverse();
        var residual = y - (x * reference);
        var s = Math.Sqrt(residual.DotProduct(residual) / (n - 3));
        var x0 = Vector<double>.Build.DenseOfArray([1, 17, 33]);
        var t = StudentT.InvCDF(0, 1, n - 3, 0.975);
        var expectedHalf = t * s * Math.Sqrt(1 + x0.DotProduct(xtxInverse * x0));

        var p = model.Predict(new TreeFeatures(17, 33));
        Assert.Equal(reference.DotProduct(x0), p.Seconds, 1e-8);
        Assert.Equal(expectedHalf, p.HalfWidthSeconds, 1e-8);

        // The group interval equals the interval of the summed feature vector: m + x̄ᵀ(XᵀX)⁻¹x̄ with x̄ = Σx₀.
        var group = new[] { new TreeFeatures(17, 33), new TreeFeatures(4, 60), new TreeFeatures(30, 10) };
        var xs = Vector<double>.Build.DenseOfArray([3, 51, 103]);
        var total = model.PredictTotal(group);
        Assert.Equal(t * s * Math.Sqrt(3 + xs.DotProduct(xtxInverse * xs)), total.HalfWidthSeconds, 1e-8);
        Assert.Equal(group.Sum(g => model.Predict(g).Seconds), total.Seconds, 1e-8);
    }

    [Fact]
    public void Prediction_intervals_cover_new_trees_and_groups_at_the_nominal_rate_on_simulated_data()
    {
        // 2,000 seeded draws: 30 planned trees from seconds = 20 + 6·cuts + 0.5·size + N(0, 5²), then one
        // new tree and a group of 10 new trees. At 95 % the binomial sd of the rate is ≈ 0.5 %, so ±2 % is wide.
        var rng = new Random(20240601);
        var noise = new Normal(0, 5, rng);
        const int draws = 2000;
        int single = 0, grouped = 0;
        for (var d = 0; d < draws; d++)
        {
            var cuts = new double[30];
            var sizes = new double[30];
            var seconds = new double[30];
            for (var i = 0; i < 30; i++)
            {
                cuts[i] = rng.Next(5, 40);
                sizes[i] = 10 + (50 * rng.NextDouble());
                seconds[i] = Truth(cuts[i], sizes[i]) + noise.Sample();
            }

            var model = TreeTimeModel.FitObservations(cuts, sizes, seconds, Settings);
            var tree = new TreeFeatures(rng.Next(5, 40), 10 + (50 * rng.NextDouble()));
            var p = model.Predict(tree);
            var actual = Truth(tree.ScanCuts, tree.SizeM) + noise.Sample();
            single += actual >= p.LowerSeconds && actual <= p.UpperSeconds ? 1 : 0;

            var group = Enumerable.Range(0, 10).Select(_ => new TreeFeatures(rng.Next(5, 40), 10 + (50 * rng.NextDouble()))).ToArray();
            var g = model.PredictTotal(group);
            var actualTotal = group.Sum(f => Truth(f.ScanCuts, f.SizeM) + noise.Sample());
            grouped += actualTotal >= g.LowerSeconds && actualTotal <= g.UpperSeconds ? 1 : 0;
        }

        Assert.InRange(single / (double)draws, 0.93, 0.97);
        Assert.InRange(grouped / (double)draws, 0.93, 0.97);

        static double Truth(double c, double s) => 20 + (6 * c) + (0.5 * s);
    }

    [Fact]
    public void Ratio_model_interval_covers_at_the_nominal_rate_when_seconds_per_cut_is_independent()
    {
        // 4 planned trees (too few for least squares); seconds per cut ~ N(6, 1²) independently per tree.
        var rng = new Random(99);
        var ratio = new Normal(6, 1, rng);
        const int draws = 2000;
        var covered = 0;
        for (var d = 0; d < draws; d++)
        {
            var cuts = Enumerable.Range(0, 4).Select(_ => (double)rng.Next(5, 30)).ToArray();
            var seconds = cuts.Select(c => c * ratio.Sample()).ToArray();
            var model = TreeTimeModel.FitObservations(cuts, new double[4], seconds, Settings);
            var c0 = rng.Next(5, 30);
            var p = model.Predict(new TreeFeatures(c0, 0));
            var actual = c0 * ratio.Sample();
            covered += actual >= p.LowerSeconds && actual <= p.UpperSeconds ? 1 : 0;
        }

        Assert.InRange(covered / (double)draws, 0.93, 0.97);
    }

    /// <summary>
    /// Four planned trees: seconds/cut = 60/10, 100/20, 40/5, 48/8 = 6, 5, 8, 6; mean 6.25; squared
    /// deviations 0.0625 + 1.5625 + 3.0625 + 0.0625 = 4.75; sd = √(4.75/3). A tree with 10 cuts: 62.5 s,
    /// half-width t(0.975, 3)·sd·10·√(1 + 1/4). t(0.975, 3) = 3.182446 (standard t table, recalled from memory).
    /// </summary>
    [Fact]
    public void Four_planned_trees_fall_back_to_seconds_per_cut_with_its_spread()
    {
        var trees = new[]
        {
            Planned(10, 60), Planned(20, 100), Planned(5, 40), Planned(8, 48),
            Unplanned(50), // unplanned trees do not enter the fit
        };
        var model = TreeTimeModel.Fit(trees, Settings);

        Assert.Equal(TreeTimeModelKind.SecondsPerCut, model.Kind);
        Assert.False(model.IsGuess);
        Assert.Equal(4, model.SampleCount);
        Assert.Equal(6.25, model.Coefficients[0], 1e-12);
        Assert.Equal(Math.Sqrt(4.75 / 3), model.SecondsPerCutStandardDeviation, 1e-12);
        Assert.Equal(3.182446, model.TQuantile, 1e-5);
        var p = model.Predict(new TreeFeatures(10, 0));
        Assert.Equal(62.5, p.Seconds, 1e-9);
        Assert.Equal(model.TQuantile * Math.Sqrt(4.75 / 3) * 10 * Math.Sqrt(1.25), p.HalfWidthSeconds, 1e-9);
        Assert.Contains("seconds per cut", model.Description, StringComparison.Ordinal);
    }

    [Fact]
    public void A_single_planned_tree_gives_its_ratio_with_no_interval()
    {
        var model = TreeTimeModel.Fit([Planned(10, 70)], Settings);
        Assert.Equal(TreeTimeModelKind.SecondsPerCut, model.Kind);
        var p = model.Predict(new TreeFeatures(4, 0));
        Assert.Equal(28, p.Seconds, 1e-12);
        Assert.False(p.HasInterval);
    }

    [Fact]
    public void No_planned_tree_is_a_flagged_guess_from_the_default_seconds_per_cut()
    {
        var settings = Settings with { DefaultSecondsPerCut = 7.5 };
        var model = TreeTimeModel.Fit([Unplanned(10), Unplanned(3)], settings);
        Assert.Equal(TreeTimeModelKind.DefaultGuess, model.Kind);
        Assert.True(model.IsGuess);
        var p = model.Predict(new TreeFeatures(10, 30));
        Assert.Equal(75, p.Seconds, 1e-12);
        Assert.True(double.IsPositiveInfinity(p.HalfWidthSeconds));
        Assert.Contains("guess", model.Description, StringComparison.Ordinal);
    }

    [Fact]
    public void A_rank_deficient_design_falls_back_to_the_ratio_even_with_enough_trees()
    {
        // Six trees, all of the same size: the size column is a multiple of the intercept column.
        var trees = Enumerable.Range(1, 6).Select(i => Planned(i * 3, i * 20.0, sizeM: 25)).ToArray();
        var model = TreeTimeModel.Fit(trees, Settings);
        Assert.Equal(TreeTimeModelKind.SecondsPerCut, model.Kind);

        // Five trees of different sizes suffice for least squares.
        var varied = Enumerable.Range(1, 5).Select(i => Planned(i * 3, (i * 20.0) + (i * i), sizeM: 10 + (i * i))).ToArray();
        Assert.Equal(TreeTimeModelKind.LeastSquares, TreeTimeModel.Fit(varied, Settings).Kind);
    }

    [Fact]
    public void An_empty_group_predicts_zero_with_zero_width()
    {
        var model = TreeTimeModel.Fit([], Settings);
        var p = model.PredictTotal([]);
        Assert.Equal(0, p.Seconds);
        Assert.Equal(0, p.HalfWidthSeconds);
    }

    [Fact]
    public void Invalid_confidence_level_is_rejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => TreeTimeModel.Fit([], Settings with { ConfidenceLevel = 1 }));
    }

    private static void AssertRelative(double expected, double actual, double relative) =>
        Assert.True(Math.Abs(actual - expected) <= relative * Math.Abs(expected), $"expected {expected:R}, got {actual:R}");

    private static TreeRecord Planned(int scanCuts, double seconds, double sizeM = 0) =>
        new("t", "A", "1", 0, true, seconds, scanCuts, 0, 0, scanCuts, sizeM, 0);

    private static TreeRecord Unplanned(int scanCuts) =>
        new("u", "A", "1", 0, false, null, 0, 0, 0, scanCuts, 10, 0);
}
