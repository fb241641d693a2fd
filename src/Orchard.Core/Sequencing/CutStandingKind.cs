namespace Orchard.Core.Sequencing;

/// <summary>Whether a cut is for the machine at all.</summary>
public enum CutStandingKind
{
    /// <summary>Within the shear's rating and not made moot by another cut.</summary>
    Eligible,

    /// <summary>Thicker than the shear is rated for: a hand cut.</summary>
    AboveShearRating,

    /// <summary>Another cut of the scan removes its wood.</summary>
    Moot,
}
