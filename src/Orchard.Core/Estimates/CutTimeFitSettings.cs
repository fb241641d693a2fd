namespace Orchard.Core.Estimates;

/// <summary>When measured cut durations replace the arm profile's cut-time model.</summary>
/// <param name="MinimumCuts">
/// Measured cuts a block needs before its own line is used [20]: with fewer, one unusual cut moves the line
/// too far; 20 keeps the slope's standard error near a quarter of its value on the demo's spread of
/// diameters. Our choice, not a sourced figure.
/// </param>
/// <param name="MinimumDiameterSpreadMm">The diameters must spread at least this far (max − min) for a slope to mean anything [2 mm].</param>
/// <param name="ConfidenceLevel">Two-sided level of the intervals [0.95].</param>
public sealed record CutTimeFitSettings(int MinimumCuts = 20, double MinimumDiameterSpreadMm = 2.0, double ConfidenceLevel = 0.95)
{
    public static CutTimeFitSettings Default { get; } = new();
}
