namespace Orchard.Core.Estimates;

/// <summary>
/// Settings of the time estimates. Defaults in brackets; those marked "common practice" are typical
/// values of the trade without a cited source, to be replaced by the grower's own figures.
/// </summary>
public sealed record EstimateSettings
{
    /// <summary>
    /// Platform travel speed between trees [0.5 km/h]. Common practice: orchard platforms creep at
    /// walking-pace fractions, roughly 0.3–1 km/h, while working a row.
    /// </summary>
    public double PlatformSpeedKmh { get; init; } = 0.5;

    /// <summary>
    /// Seconds the platform needs at each stop to halt, settle and re-localise before the arm may move
    /// [5 s]. Common practice (order of magnitude for a braked, re-levelled platform).
    /// </summary>
    public double SettleSecondsPerStop { get; init; } = 5.0;

    /// <summary>
    /// Arm seconds per cut used when no tree has been planned yet, a stated guess [8 s]: one approach,
    /// close-cut-open of the shear and retreat. Common practice for a shear on a serial arm; the estimate
    /// is flagged as a guess and carries no interval.
    /// </summary>
    public double DefaultSecondsPerCut { get; init; } = 8.0;

    /// <summary>Two-sided confidence level of the prediction intervals [0.95].</summary>
    public double ConfidenceLevel { get; init; } = 0.95;

    /// <summary>
    /// Manual-pruning reference: person-seconds to prune one tree by hand [120 s, i.e. 30 trees per
    /// person-hour]. Common practice (order of magnitude for dormant pruning of trained high-density
    /// apple walls); the manager should set it from the crew's records.
    /// </summary>
    public double ManualSecondsPerTree { get; init; } = 120.0;

    /// <summary>
    /// Hand follow-up: person-seconds to make one cut the machine leaves [20 s]: walk to it, reach it with
    /// loppers or a pole pruner, cut. A stated guess (common practice, no sourced figure); the manager
    /// should set it from the crew's records.
    /// </summary>
    public double HandSecondsPerCut { get; init; } = 20.0;

    /// <summary>The same reference expressed as trees per person-hour.</summary>
    public double ManualTreesPerPersonHour => 3600.0 / ManualSecondsPerTree;

    /// <summary>Platform speed in metres per second.</summary>
    public double PlatformSpeedMPerSecond => PlatformSpeedKmh / 3.6;

    public static EstimateSettings Default { get; } = new();
}
