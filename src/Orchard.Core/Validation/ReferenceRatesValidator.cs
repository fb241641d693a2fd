using Orchard.Core.Estimates;

namespace Orchard.Core.Validation;

/// <summary>Checks the manager's reference rates: each, when given, a positive finite number within its bound.</summary>
public static class ReferenceRatesValidator
{
    public static ValidationReport Validate(ReferenceRates? rates)
    {
        var problems = new ProblemCollector();
        if (rates is null)
        {
            problems.Error("$", "document.missing", "Reference rates are required.");
            return problems.ToReport();
        }

        if (rates.ManualSecondsPerTree is { } manual)
        {
            problems.Positive(manual, ReferenceRates.MaxManualSecondsPerTree, "$.manualSecondsPerTree", "rate.manualSecondsPerTree", "Seconds per tree by hand");
        }

        if (rates.PlatformSpeedKmh is { } speed)
        {
            problems.Positive(speed, ReferenceRates.MaxPlatformSpeedKmh, "$.platformSpeedKmh", "rate.platformSpeedKmh", "The platform speed");
        }

        if (rates.HandSecondsPerCut is { } hand)
        {
            problems.Positive(hand, ReferenceRates.MaxHandSecondsPerCut, "$.handSecondsPerCut", "rate.handSecondsPerCut", "Seconds per hand cut");
        }

        return problems.ToReport();
    }
}
