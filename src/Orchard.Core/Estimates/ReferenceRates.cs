namespace Orchard.Core.Estimates;

/// <summary>
/// The orchard's own reference rates, kept in the store and edited by the manager; each replaces the
/// default of <see cref="EstimateSettings"/> when given.
/// </summary>
/// <param name="ManualSecondsPerTree">Person-seconds to prune one tree by hand.</param>
/// <param name="PlatformSpeedKmh">Platform speed along an alley, km/h.</param>
/// <param name="HandSecondsPerCut">Person-seconds to make one cut the machine leaves.</param>
public sealed record ReferenceRates(double? ManualSecondsPerTree = null, double? PlatformSpeedKmh = null, double? HandSecondsPerCut = null)
{
    /// <summary>Upper bounds the validator holds the rates to.</summary>
    public const double MaxManualSecondsPerTree = 100_000, MaxPlatformSpeedKmh = 100, MaxHandSecondsPerCut = 3_600;

    /// <summary><paramref name="settings"/> with every rate given here in place of its default.</summary>
    public EstimateSettings ApplyTo(EstimateSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        return settings with
        {
            ManualSecondsPerTree = ManualSecondsPerTree ?? settings.ManualSecondsPerTree,
            PlatformSpeedKmh = PlatformSpeedKmh ?? settings.PlatformSpeedKmh,
            HandSecondsPerCut = HandSecondsPerCut ?? settings.HandSecondsPerCut,
        };
    }

    /// <summary>Every rate, the defaults of <paramref name="settings"/> filled in.</summary>
    public static ReferenceRates Of(EstimateSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        return new ReferenceRates(settings.ManualSecondsPerTree, settings.PlatformSpeedKmh, settings.HandSecondsPerCut);
    }
}
