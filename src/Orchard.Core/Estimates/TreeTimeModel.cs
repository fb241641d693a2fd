using System.Globalization;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace Orchard.Core.Estimates;

/// <summary>
/// Arm seconds of a tree not yet planned, learned from the trees that were. Which model is fitted
/// depends on the data (see <see cref="Kind"/> and <see cref="Description"/>):
/// <list type="bullet">
/// <item><see cref="TreeTimeModelKind.LeastSquares"/> with at least <see cref="MinimumTreesForLeastSquares"/>
/// usable planned trees and a full-rank design: ordinary least squares
/// seconds = b0 + b1·scan cuts + b2·branch length (m), solved by QR on unit-scaled columns. The
/// prediction interval of one new tree is ŷ ± t(1 − α/2, n − p)·s·√(1 + x₀ᵀ(XᵀX)⁻¹x₀).</item>
/// <item><see cref="TreeTimeModelKind.SecondsPerCut"/> with fewer trees (or a rank-deficient design):
/// r̄ = mean of seconds/cut over the planned trees with at least one cut, s_r its sample standard
/// deviation; one tree with c cuts is predicted c·r̄ ± t(1 − α/2, n − 1)·s_r·c·√(1 + 1/n). With a single
/// such tree there is no spread and the interval is infinite.</item>
/// <item><see cref="TreeTimeModelKind.DefaultGuess"/> with no usable planned tree:
/// <see cref="EstimateSettings.DefaultSecondsPerCut"/>·c, flagged by <see cref="IsGuess"/>, interval infinite.</item>
/// </list>
/// The scan cut count is the predictor (not the scheduled cuts) because it is known for every scanned
/// tree, planned or not. A planned tree is usable when its schedule seconds are finite and not negative and
/// it schedules at least one cut: a tree with nothing scheduled (its cuts all left to the hand crew) is left
/// out and counted in <see cref="LeftOutNothingScheduled"/>, since its 0 s would drag the line towards zero.
/// </summary>
public sealed class TreeTimeModel
{
    /// <summary>Parameters of the least-squares model: intercept, per cut, per metre of branch.</summary>
    public const int ParameterCount = 3;

    /// <summary>Fewest usable planned trees for the least-squares model: p + 2, so the residual has 2 degrees of freedom.</summary>
    public const int MinimumTreesForLeastSquares = ParameterCount + 2;

    /// <summary>A unit-scaled column whose QR diagonal falls below this is taken as linearly dependent.</summary>
    private const double RankTolerance = 1e-10;

    private readonly Matrix<double>? _xtxInverse;
    private readonly double _tQuantile;

    private TreeTimeModel(
        TreeTimeModelKind kind,
        int sampleCount,
        int degreesOfFreedom,
        double confidenceLevel,
        double[] coefficients,
        double[] coefficientStandardErrors,
        double residualStandardErrorSeconds,
        double secondsPerCutStandardDeviation,
        Matrix<double>? xtxInverse)
    {
        Kind = kind;
        SampleCount = sampleCount;
        DegreesOfFreedom = degreesOfFreedom;
        ConfidenceLevel = confidenceLevel;
        Coefficients = coefficients;
        CoefficientStandardErrors = coefficientStandardErrors;
        ResidualStandardErrorSeconds = residualStandardErrorSeconds;
        SecondsPerCutStandardDeviation = secondsPerCutStandardDeviation;
        _xtxInverse = xtxInverse;
        _tQuantile = degreesOfFreedom >= 1
            ? StudentT.InvCDF(0.0, 1.0, degreesOfFreedom, 1.0 - ((1.0 - confidenceLevel) / 2.0))
            : double.NaN;
        _description = Describe();
    }

    private readonly string _description;

    public TreeTimeModelKind Kind { get; }

    /// <summary>True when no tree has been planned and the estimate rests on the default seconds per cut.</summary>
    public bool IsGuess => Kind == TreeTimeModelKind.DefaultGuess;

    /// <summary>Planned trees the model was fitted on (0 for the guess).</summary>
    public int SampleCount { get; }

    /// <summary>Residual degrees of freedom: n − 3 for least squares, n − 1 for the ratio, 0 for the guess.</summary>
    public int DegreesOfFreedom { get; }

    public double ConfidenceLevel { get; }

    /// <summary>
    /// Least squares: [b0 seconds, b1 seconds per cut, b2 seconds per metre of branch]. Ratio and guess:
    /// [seconds per cut].
    /// </summary>
    public IReadOnlyList<double> Coefficients { get; }

    /// <summary>Standard errors of <see cref="Coefficients"/> (s·√diag((XᵀX)⁻¹) or s_r/√n); NaN where undefined.</summary>
    public IReadOnlyList<double> CoefficientStandardErrors { get; }

    /// <summary>Least squares: residual standard error s in seconds. NaN for the other models.</summary>
    public double ResidualStandardErrorSeconds { get; }

    /// <summary>Ratio model: sample standard deviation of seconds per cut. NaN for the other models.</summary>
    public double SecondsPerCutStandardDeviation { get; }

    /// <summary>Which model was used, on how many trees, with its coefficients, in words; and the planned trees left out.</summary>
    public string Description => LeftOutNothingScheduled == 0
        ? _description
        : _description + $" {LeftOutNothingScheduled} planned tree(s) with nothing scheduled were left out of the fit: their 0 s says nothing about a tree's work and would pull the line down.";

    /// <summary>Planned trees left out of the fit because their schedule makes no cut.</summary>
    public int LeftOutNothingScheduled { get; private set; }

    /// <summary>Two-sided Student t quantile t(1 − α/2, dof) used by the intervals; NaN without degrees of freedom.</summary>
    internal double TQuantile => _tQuantile;

    /// <summary>(XᵀX)⁻¹ of the least-squares fit, in the original units; null for the other models.</summary>
    internal Matrix<double>? XtXInverse => _xtxInverse;

    /// <summary>Fits the model on the planned trees among <paramref name="trees"/>.</summary>
    public static TreeTimeModel Fit(IReadOnlyList<TreeRecord> trees, EstimateSettings settings)
    {
        ArgumentNullException.ThrowIfNull(trees);
        var cuts = new List<double>();
        var sizes = new List<double>();
        var seconds = new List<double>();
        var leftOut = 0;
        foreach (var tree in trees)
        {
            if (tree.IsPlanned && tree.ScheduledCuts == 0 && tree.ScanCutCount > 0)
            {
                leftOut++;
                continue;
            }

            if (tree.IsPlanned && tree.ScheduleSeconds is { } s && double.IsFinite(s) && s >= 0)
            {
                cuts.Add(tree.ScanCutCount);
                sizes.Add(tree.TotalBranchLengthM);
                seconds.Add(s);
            }
        }

        var model = FitObservations(cuts, sizes, seconds, settings);
        model.LeftOutNothingScheduled = leftOut;
        return model;
    }

    /// <summary>Fits on raw observations (predictor 1, predictor 2, response), in the same order.</summary>
    internal static TreeTimeModel FitObservations(
        IReadOnlyList<double> cuts, IReadOnlyList<double> sizes, IReadOnlyList<double> seconds, EstimateSettings settings)
    {
        ArgumentNullException.ThrowIfNull(cuts);
        ArgumentNullException.ThrowIfNull(sizes);
        ArgumentNullException.ThrowIfNull(seconds);
        ArgumentNullException.ThrowIfNull(settings);
        if (cuts.Count != sizes.Count || cuts.Count != seconds.Count)
        {
            throw new ArgumentException("Predictors and responses must have the same length.", nameof(seconds));
        }

        if (!(settings.ConfidenceLevel > 0 && settings.ConfidenceLevel < 1))
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "ConfidenceLevel must lie strictly between 0 and 1.");
        }

        if (!(double.IsFinite(settings.DefaultSecondsPerCut) && settings.DefaultSecondsPerCut >= 0))
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "DefaultSecondsPerCut must be finite and not negative.");
        }

        if (cuts.Count >= MinimumTreesForLeastSquares
            && TryLeastSquares(cuts, sizes, seconds, settings.ConfidenceLevel) is { } leastSquares)
        {
            return leastSquares;
        }

        var ratios = new List<double>();
        for (var i = 0; i < cuts.Count; i++)
        {
            if (cuts[i] > 0)
            {
                ratios.Add(seconds[i] / cuts[i]);
            }
        }

        if (ratios.Count > 0)
        {
            var n = ratios.Count;
            var mean = ratios.Average();
            var sd = double.NaN;
            if (n >= 2)
            {
                var ss = 0.0;
                foreach (var r in ratios)
                {
                    ss += (r - mean) * (r - mean);
                }

                sd = Math.Sqrt(ss / (n - 1));
            }

            return new TreeTimeModel(
                TreeTimeModelKind.SecondsPerCut, n, n - 1, settings.ConfidenceLevel,
                [mean], [sd / Math.Sqrt(n)], double.NaN, sd, null);
        }

        return new TreeTimeModel(
            TreeTimeModelKind.DefaultGuess, 0, 0, settings.ConfidenceLevel,
            [settings.DefaultSecondsPerCut], [double.NaN], double.NaN, double.NaN, null);
    }

    private static TreeTimeModel? TryLeastSquares(
        IReadOnlyList<double> cuts, IReadOnlyList<double> sizes, IReadOnlyList<double> seconds, double confidenceLevel)
    {
        var n = cuts.Count;
        var x = Matrix<double>.Build.Dense(n, ParameterCount, (i, j) => j switch
        {
            0 => 1.0,
            1 => cuts[i],
            _ => sizes[i],
        });
        var y = Vector<double>.Build.Dense(n, i => seconds[i]);

        // Scale every column to unit length so the rank test and the solve do not depend on units.
        var norms = x.ColumnNorms(2.0);
        if (norms.Exists(v => !(v > 0) || !double.IsFinite(v)))
        {
            return null;
        }

        var scaleInverse = Matrix<double>.Build.DenseOfDiagonalVector(norms.Map(v => 1.0 / v));
        var scaled = x * scaleInverse;
        var qr = scaled.QR(QRMethod.Thin);
        var r = qr.R;
        for (var j = 0; j < ParameterCount; j++)
        {
            if (Math.Abs(r[j, j]) <= RankTolerance)
            {
                return null;
            }
        }

        var beta = scaleInverse * qr.Solve(y);
        var residual = y - (x * beta);
        var dof = n - ParameterCount;
        var s = Math.Sqrt(residual.DotProduct(residual) / dof);

        // (XᵀX)⁻¹ = D⁻¹ R⁻¹ R⁻ᵀ D⁻¹ with X·D⁻¹ = QR.
        var rInverse = r.Inverse();
        var xtxInverse = scaleInverse * rInverse * rInverse.Transpose() * scaleInverse;
        var se = new double[ParameterCount];
        for (var j = 0; j < ParameterCount; j++)
        {
            se[j] = s * Math.Sqrt(xtxInverse[j, j]);
        }

        return new TreeTimeModel(
            TreeTimeModelKind.LeastSquares, n, dof, confidenceLevel, beta.ToArray(), se, s, double.NaN, xtxInverse);
    }

    /// <summary>Prediction for one tree not yet planned.</summary>
    public TreeTimePrediction Predict(TreeFeatures tree)
    {
        ArgumentNullException.ThrowIfNull(tree);
        return PredictTotal([tree]);
    }

    /// <summary>
    /// Predicted total seconds of a group of trees not yet planned, with the prediction interval of the
    /// total. The interval is the exact one under the model's assumption of independent errors for new
    /// trees, and it keeps the error of the fitted coefficients, which all trees share (summing per-tree
    /// half-widths in quadrature would drop that shared part and understate the interval):
    /// least squares Var = s²(m + x̄ᵀ(XᵀX)⁻¹x̄) with x̄ the sum of the m feature vectors; ratio
    /// Var = s_r²(Σc² + (Σc)²/n). Half-width = t·√Var. An empty group predicts 0 ± 0.
    /// </summary>
    public TreeTimePrediction PredictTotal(IReadOnlyCollection<TreeFeatures> trees)
    {
        ArgumentNullException.ThrowIfNull(trees);
        var m = trees.Count;
        if (m == 0)
        {
            return new TreeTimePrediction(0, 0, ConfidenceLevel);
        }

        double sumCuts = 0, sumCutsSquared = 0, sumSize = 0;
        foreach (var tree in trees)
        {
            sumCuts += tree.ScanCuts;
            sumCutsSquared += tree.ScanCuts * tree.ScanCuts;
            sumSize += tree.SizeM;
        }

        switch (Kind)
        {
            case TreeTimeModelKind.LeastSquares:
            {
                var xs = Vector<double>.Build.DenseOfArray([m, sumCuts, sumSize]);
                var seconds = (Coefficients[0] * m) + (Coefficients[1] * sumCuts) + (Coefficients[2] * sumSize);
                var variance = ResidualStandardErrorSeconds * ResidualStandardErrorSeconds
                    * (m + xs.DotProduct(_xtxInverse! * xs));
                return new TreeTimePrediction(seconds, _tQuantile * Math.Sqrt(variance), ConfidenceLevel);
            }

            case TreeTimeModelKind.SecondsPerCut:
            {
                var seconds = Coefficients[0] * sumCuts;
                if (sumCutsSquared == 0)
                {
                    return new TreeTimePrediction(seconds, 0, ConfidenceLevel);
                }

                var half = SampleCount >= 2
                    ? _tQuantile * SecondsPerCutStandardDeviation
                        * Math.Sqrt(sumCutsSquared + (sumCuts * sumCuts / SampleCount))
                    : double.PositiveInfinity;
                return new TreeTimePrediction(seconds, half, ConfidenceLevel);
            }

            default:
                return new TreeTimePrediction(Coefficients[0] * sumCuts, double.PositiveInfinity, ConfidenceLevel);
        }
    }

    private string Describe() => Kind switch
    {
        TreeTimeModelKind.LeastSquares => string.Create(
            CultureInfo.InvariantCulture,
            $"least squares on {SampleCount} planned trees: seconds = {Coefficients[0]:0.###} + {Coefficients[1]:0.###}·cuts + {Coefficients[2]:0.###}·branch m (s = {ResidualStandardErrorSeconds:0.###} s, {DegreesOfFreedom} dof)"),
        TreeTimeModelKind.SecondsPerCut => string.Create(
            CultureInfo.InvariantCulture,
            $"seconds per cut on {SampleCount} planned trees (too few for least squares): {Coefficients[0]:0.###} s/cut (sd {SecondsPerCutStandardDeviation:0.###})"),
        _ => string.Create(
            CultureInfo.InvariantCulture,
            $"guess: no planned tree, default {Coefficients[0]:0.###} s/cut, no interval"),
    };
}
