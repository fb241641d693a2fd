namespace Orchard.Core.Sequencing;

/// <summary>One cut's standing before any planning (see <see cref="CutEligibility"/>).</summary>
/// <param name="RemovedBy">For a moot cut, the index of the cut nearest the root that removes its wood.</param>
public sealed record CutStanding(int CutIndex, CutStandingKind Kind, int? RemovedBy);
