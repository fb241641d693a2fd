namespace Orchard.Core.Demo;

/// <summary>
/// Thresholds of the dormant-pruning rules the demo marks its cuts with. These follow tall-spindle
/// practice (common practice; the figures are typical guidance, recalled from memory, not one source).
/// </summary>
public sealed record PruningRuleSettings
{
    /// <summary>Remove a lateral thicker than this share of the leader's diameter where it attaches (about half).</summary>
    public double MaxLateralToLeaderRatio { get; init; } = 0.5;

    /// <summary>Two laterals on the same side closer than this up the leader crowd each other; the weaker goes.</summary>
    public double MinLateralSpacingM { get; init; } = 0.12;

    /// <summary>"The same side": azimuths closer than this, radians (45°).</summary>
    public double SameSideAzimuthRad { get; init; } = Math.PI / 4;

    /// <summary>Head a lateral back when it is this much longer than the spindle's cone allows.</summary>
    public double OverLengthFactor { get; init; } = 1.1;

    /// <summary>Head the leader back to this height when it grows above <see cref="LeaderHeadingAboveM"/>.</summary>
    public double LeaderHeadingHeightM { get; init; } = 3.35;

    /// <inheritdoc cref="LeaderHeadingHeightM"/>
    public double LeaderHeadingAboveM { get; init; } = 3.45;

    /// <summary>
    /// Thinning cuts leave a short stub beyond the parent's bark, as tall-spindle renewal (bevel) cuts do:
    /// 35 mm, which also keeps the shear's jaws clear of the parent limb (common practice: 2–4 cm stubs).
    /// </summary>
    public double ThinningStubM { get; init; } = 0.035;

    public static PruningRuleSettings Default { get; } = new();
}
