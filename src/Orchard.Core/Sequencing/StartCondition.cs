namespace Orchard.Core.Sequencing;

/// <summary>See <see cref="StartAssessment"/>.</summary>
public enum StartCondition
{
    /// <summary>Free, with room to move: moves start right there.</summary>
    Clear,

    /// <summary>In contact with the limb being cut or too close to the wood; a checked retreat along the tool axis leads out.</summary>
    Retreated,

    /// <summary>A joint is outside its limits: the controller's report is wrong or the arm needs recovery first.</summary>
    OutsideLimits,

    /// <summary>In contact, and no straight retreat leads out: a person must clear the arm.</summary>
    Trapped,
}
