namespace Orchard.Core.Estimates;

/// <summary>Which model <see cref="TreeTimeModel"/> fitted, chosen by how much planned data there is.</summary>
public enum TreeTimeModelKind
{
    /// <summary>
    /// Ordinary least squares seconds ≈ b0 + b1·cuts + b2·branch length on the planned trees
    /// (at least p + 2 = 5 usable trees and a full-rank design).
    /// </summary>
    LeastSquares,

    /// <summary>Seconds = (mean seconds per cut of the planned trees) · cuts, with the spread of that ratio.</summary>
    SecondsPerCut,

    /// <summary>No planned tree: the default seconds per cut, a guess with no interval.</summary>
    DefaultGuess,
}
