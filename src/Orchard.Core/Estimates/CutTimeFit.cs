using System.Globalization;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.LinearRegression;

namespace Orchard.Core.Estimates;

/// <summary>
/// A block's cut-time model learned from the durations the controller measured: ordinary least squares
/// seconds = a + b·d (d the cut's diameter in mm), fitted with MathNet.Numerics. With n cuts, d̄ their mean
/// diameter, Sxx = Σ(dᵢ − d̄)² and s² = Σ residual² / (n − 2): se(b) = s / √Sxx, se(a) = s·√(1/n + d̄²/Sxx), and
/// one new cut at d₀ is predicted a + b·d₀ ± t(1 − α/2, n − 2)·s·√(1 + 1/n + (d₀ − d̄)²/Sxx). Used only with at
/// least <see cref="CutTimeFitSettings.MinimumCuts"/> cuts spread over <see cref="CutTimeFitSettings.MinimumDiameterSpreadMm"/>;
/// otherwise <see cref="Source"/> is <see cref="CutTimeSource.ArmProfile"/> and <see cref="Description"/> says why.
/// </summary>
public sealed class CutTimeFit
{
    private readonly double _tQuantile;

    private CutTimeFit(string block, CutTimeSource source, int sampleCount, double a, double b, double seA, double seB, double s, double meanDiameterMm, double sxx, double confidenceLevel, string description)
    {
        Block = block;
        Source = source;
        SampleCount = sampleCount;
        InterceptSeconds = a;
        SecondsPerMm = b;
        InterceptStandardError = seA;
        SlopeStandardError = seB;
        ResidualStandardErrorSeconds = s;
        MeanDiameterMm = meanDiameterMm;
        SxxMm2 = sxx;
        ConfidenceLevel = confidenceLevel;
        _tQuantile = source == CutTimeSource.Measured ? StudentT.InvCDF(0.0, 1.0, sampleCount - 2, 1.0 - ((1.0 - confidenceLevel) / 2.0)) : double.NaN;
        Description = description;
    }

    public string Block { get; }

    /// <summary>Measured (this line is used) or the arm profile (too few cuts: the planned cut seconds stand).</summary>
    public CutTimeSource Source { get; }

    /// <summary>Measured cuts in the block.</summary>
    public int SampleCount { get; }

    /// <summary>a, seconds (NaN unless measured).</summary>
    public double InterceptSeconds { get; }

    /// <summary>b, seconds per millimetre of diameter (NaN unless measured).</summary>
    public double SecondsPerMm { get; }

    public double InterceptStandardError { get; }

    public double SlopeStandardError { get; }

    /// <summary>s, seconds.</summary>
    public double ResidualStandardErrorSeconds { get; }

    public double MeanDiameterMm { get; }

    /// <summary>Σ(dᵢ − d̄)², mm².</summary>
    public double SxxMm2 { get; }

    public double ConfidenceLevel { get; }

    /// <summary>t(1 − α/2, n − 2); NaN unless measured.</summary>
    public double TQuantile => _tQuantile;

    /// <summary>Which model, from how many cuts, in words.</summary>
    public string Description { get; }

    /// <summary>Seconds for one cut of <paramref name="diameterMm"/> by the measured line.</summary>
    public double PredictSeconds(double diameterMm) => InterceptSeconds + (SecondsPerMm * diameterMm);

    /// <summary>Half-width of the prediction interval of one new cut of <paramref name="diameterMm"/>.</summary>
    public double PredictionHalfWidthSeconds(double diameterMm) =>
        _tQuantile * ResidualStandardErrorSeconds * Math.Sqrt(1.0 + (1.0 / SampleCount) + ((diameterMm - MeanDiameterMm) * (diameterMm - MeanDiameterMm) / SxxMm2));

    /// <summary>
    /// The measured seconds of <paramref name="cuts"/> cuts whose diameters sum to <paramref name="diameterSumMm"/>:
    /// n·a + b·Σd (the line is linear in d, so the sum is all it needs).
    /// </summary>
    public double SecondsForCuts(int cuts, double diameterSumMm) => (cuts * InterceptSeconds) + (SecondsPerMm * diameterSumMm);

    /// <summary>Fits the block's line on (diameter mm, seconds) pairs; non-finite or non-positive pairs are left out.</summary>
    public static CutTimeFit Fit(string block, IEnumerable<(double DiameterMm, double Seconds)> measured, CutTimeFitSettings? settings = null)
    {
        ArgumentNullException.ThrowIfNull(block);
        ArgumentNullException.ThrowIfNull(measured);
        settings ??= CutTimeFitSettings.Default;
        if (!(settings.ConfidenceLevel is > 0 and < 1) || settings.MinimumCuts < 3)
        {
            throw new ArgumentOutOfRangeException(nameof(settings), "ConfidenceLevel must lie strictly between 0 and 1 and MinimumCuts be at least 3.");
        }

        var points = measured.Where(p => double.IsFinite(p.DiameterMm) && p.DiameterMm >= 0 && double.IsFinite(p.Seconds) && p.Seconds > 0).ToArray();
        var n = points.Length;
        string Default(string why) => $"Block {block}: {why}; the arm profile's cut-time model (as planned) is used.";
        if (n < settings.MinimumCuts)
        {
            return ArmProfile(block, n, settings, Default($"{n} measured cut{(n == 1 ? string.Empty : "s")}, fewer than the {settings.MinimumCuts} needed"));
        }

        var d = points.Select(p => p.DiameterMm).ToArray();
        var t = points.Select(p => p.Seconds).ToArray();
        if (d.Max() - d.Min() < settings.MinimumDiameterSpreadMm)
        {
            return ArmProfile(block, n, settings, Default($"{n} measured cuts, but their diameters spread less than {settings.MinimumDiameterSpreadMm:G} mm"));
        }

        var (a, b) = SimpleRegression.Fit(d, t);
        var mean = d.Average();
        var sxx = d.Sum(x => (x - mean) * (x - mean));
        var sse = 0.0;
        for (var i = 0; i < n; i++)
        {
            var residual = t[i] - (a + (b * d[i]));
            sse += residual * residual;
        }

        var s = Math.Sqrt(sse / (n - 2));
        var seB = s / Math.Sqrt(sxx);
        var seA = s * Math.Sqrt((1.0 / n) + (mean * mean / sxx));
        var description = string.Create(CultureInfo.InvariantCulture,
            $"Block {block}: least squares on {n} measured cuts, seconds = {a:F3} + {b:F4}·diameter mm (s = {s:F3} s, {n - 2} dof; slope ± {seB:F4}).");
        return new CutTimeFit(block, CutTimeSource.Measured, n, a, b, seA, seB, s, mean, sxx, settings.ConfidenceLevel, description);
    }

    private static CutTimeFit ArmProfile(string block, int n, CutTimeFitSettings settings, string description) =>
        new(block, CutTimeSource.ArmProfile, n, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, settings.ConfidenceLevel, description);
}
