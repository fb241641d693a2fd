namespace Orchard.Core.Estimates;

/// <summary>
/// Predicted arm seconds of one tree or of a group of trees, with the half-width of the two-sided
/// prediction interval at <see cref="ConfidenceLevel"/>. The half-width is +∞ when the model cannot
/// give an interval (a guess, or a ratio from a single tree).
/// </summary>
public sealed record TreeTimePrediction(double Seconds, double HalfWidthSeconds, double ConfidenceLevel)
{
    public bool HasInterval => double.IsFinite(HalfWidthSeconds);

    public double LowerSeconds => Seconds - HalfWidthSeconds;

    public double UpperSeconds => Seconds + HalfWidthSeconds;
}
