namespace Orchard.Core.Sequencing;

/// <summary>
/// Group <see cref="Before"/> must be visited earlier in the tour than group <see cref="After"/>. Both are
/// indices into <see cref="TourProblem.Groups"/>; a mandatory node takes part in a precedence by being
/// given as a group of one.
/// </summary>
public readonly record struct GroupPrecedence(int Before, int After);
