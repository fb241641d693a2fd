namespace Orchard.Core.Stops;

/// <summary>
/// Where the service looks for stops and what a stop costs. Defaults in brackets; the platform figures
/// are common practice for a slow-moving orchard platform, not a maker's.
/// </summary>
public sealed record StopSearchSettings
{
    /// <summary>Stops are looked for this far either side of the tablet's stand along the row [0.6 m].</summary>
    public double AlongRowRangeM { get; init; } = 0.6;

    /// <summary>… at this step [0.1 m].</summary>
    public double AlongRowStepM { get; init; } = 0.1;

    /// <summary>
    /// Offsets from the stand line into the alley (positive: further from the row) tried at each place
    /// along it, in order of preference [0, +0.1, −0.1, +0.2 m]. Keep them within what the alley allows.
    /// </summary>
    public IReadOnlyList<double> IntoAlleyOffsetsM { get; init; } = [0.0, 0.1, -0.1, 0.2];

    /// <summary>Also look for stops in the alley on the other side of the row (worked on the pass down it) [true].</summary>
    public bool FarSide { get; init; } = true;

    /// <summary>Most stops per tree, both sides together [3].</summary>
    public int MaxStops { get; init; } = 3;

    /// <summary>An extra stop is made only when it adds at least this many cuts [1].</summary>
    public int MinCutsPerExtraStop { get; init; } = 1;

    /// <summary>
    /// Stands fully evaluated (reachability of every cut still uncovered) in the first round of the cover [3]:
    /// the best by how many cuts lie within their reach, the preferred first on a tie.
    /// </summary>
    public int StandsEvaluatedPerRound { get; init; } = 3;

    /// <summary>… and in each later round [6]: by how many of the cuts left lie within reach, the nearest to them first on a tie.</summary>
    public int StandsEvaluatedPerLaterRound { get; init; } = 6;

    /// <summary>The stowed arm must keep this much room at a stop [30 mm], so a slightly different tree from the scan does not touch it.</summary>
    public double StowClearanceM { get; init; } = 0.03;

    /// <summary>Platform speed when moving between stops at one tree [0.4 m/s].</summary>
    public double PlatformSpeedMS { get; init; } = 0.4;

    /// <summary>Settling after each platform move, before the arm may move [2 s].</summary>
    public double SettleSeconds { get; init; } = 2.0;

    public static StopSearchSettings Default { get; } = new();
}
