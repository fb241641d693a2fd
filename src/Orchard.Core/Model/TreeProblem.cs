namespace Orchard.Core.Model;

/// <summary>
/// A problem with a tree as a whole (not one cut): the arm cannot start where it is, no stop leaves it
/// room, planning ran out of time. Says what was measured and what a person can do.
/// </summary>
/// <param name="Code">A stable word for programs, e.g. <c>startNotFree</c>.</param>
/// <param name="Message">Plain words for the tablet user.</param>
/// <param name="ClearanceM">The measured clearance, negative when in contact.</param>
/// <param name="ArmLink">The arm link concerned (joint or link name), if one.</param>
/// <param name="Touches">What it touches or comes nearest to (branch, wire, post, ground, another link).</param>
/// <param name="SuggestedArmBase">A stand where the same check passes, when one was found.</param>
public sealed record TreeProblem(
    string Code,
    string Message,
    double? ClearanceM = null,
    string? ArmLink = null,
    string? Touches = null,
    ArmBasePose? SuggestedArmBase = null);
