using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Where a re-plan can start from the configuration the controller reported: clear already, clear
/// after a checked straight retreat along the tool axis, or not at all (outside a joint's limits, or in
/// contact with no way out found), with what was measured and the words to tell a person.
/// </summary>
/// <param name="RetreatPath">From the reported configuration (first) to the clear one (last); one entry when no retreat was needed.</param>
/// <param name="RetreatStationsM">The tool's distance along the retreat for each configuration of the path.</param>
/// <param name="ClearanceM">Clearance of the reported configuration (negative: in contact).</param>
/// <param name="Joint">For <see cref="StartCondition.OutsideLimits"/>, the joint.</param>
/// <param name="ArmLink">The arm link nearest to what it touches.</param>
/// <param name="Touches">What that link touches or comes nearest to (a branch, wire or post by id, the ground, another link).</param>
public sealed record StartAssessment(
    StartCondition Condition,
    IReadOnlyList<double[]> RetreatPath,
    IReadOnlyList<double> RetreatStationsM,
    double ClearanceM,
    string? Joint,
    string? ArmLink,
    string? Touches,
    string Message)
{
    public bool CanStart => Condition is StartCondition.Clear or StartCondition.Retreated;

    public double[] ClearConfiguration => RetreatPath[^1];

    /// <summary>The tree-level problem to report when the arm cannot start.</summary>
    public TreeProblem ToProblem() => new(
        Condition == StartCondition.OutsideLimits ? "startOutsideLimits" : "startTrapped",
        Message, double.IsFinite(ClearanceM) ? ClearanceM : null, Joint ?? ArmLink, Touches);
}
