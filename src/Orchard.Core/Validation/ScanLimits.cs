namespace Orchard.Core.Validation;

/// <summary>
/// Hard size limits on one tree scan (errors beyond them) and the trade's plausibility ranges
/// (warnings outside them). Defaults are documented beside each value.
/// </summary>
public sealed record ScanLimits
{
    /// <summary>20,000 nodes: a scanned high-density tree has a few hundred; this leaves room for dense scanners.</summary>
    public int MaxNodes { get; init; } = 20_000;

    /// <summary>20,000 branches (a tree has one fewer branch than nodes).</summary>
    public int MaxBranches { get; init; } = 20_000;

    /// <summary>500 cuts: far above a dormant-pruned tall-spindle tree's 10–60.</summary>
    public int MaxCuts { get; init; } = 500;

    /// <summary>200 obstacles: wires and posts near one tree number a dozen.</summary>
    public int MaxObstacles { get; init; } = 200;

    /// <summary>64 characters for any id, block or row name.</summary>
    public int MaxIdLength { get; init; } = 64;

    /// <summary>Coordinates further than 50 m from the trunk base are not one tree.</summary>
    public double MaxCoordinateM { get; init; } = 50.0;

    /// <summary>Branch radius above 0.5 m is not a fruit tree.</summary>
    public double MaxRadiusM { get; init; } = 0.5;

    /// <summary>Cut diameter above 500 mm is not a pruning cut.</summary>
    public double MaxCutDiameterMm { get; init; } = 500.0;

    /// <summary>Tree height plausibility (warning): 1.5–4.5 m covers high-density systems from super-spindle to tall spindle (common practice).</summary>
    public double MinPlausibleHeightM { get; init; } = 1.5;

    /// <inheritdoc cref="MinPlausibleHeightM"/>
    public double MaxPlausibleHeightM { get; init; } = 4.5;

    /// <summary>More than 60 cuts on one tree is unusual for dormant pruning of a trained tree (common practice): a warning.</summary>
    public int MaxPlausibleCuts { get; init; } = 60;

    /// <summary>
    /// A renewal cut's stub (warning outside): 5–50 mm outside the parent leaves buds to grow a renewal shoot
    /// without leaving a long dead snag (common practice; no sourced figure).
    /// </summary>
    public double MinPlausibleStubM { get; init; } = 0.005;

    /// <inheritdoc cref="MinPlausibleStubM"/>
    public double MaxPlausibleStubM { get; init; } = 0.05;

    /// <summary>
    /// A side branch thinner than a third of the wood cut back to it rarely takes over as the limb's end
    /// (the one-third rule for reduction cuts; common practice): a warning.
    /// </summary>
    public double MinCutBackSideRatio { get; init; } = 1.0 / 3.0;

    public static ScanLimits Default { get; } = new();
}
