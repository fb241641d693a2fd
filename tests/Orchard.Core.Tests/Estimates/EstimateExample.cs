using Orchard.Core.Estimates;

namespace Orchard.Core.Tests.Estimates;

/// <summary>
/// A small invented orchard, worked by hand in <see cref="EstimateCalculatorTests"/>.
/// Block A row 1: three scanned trees (two planned), layout does not give a tree count.
/// Block A row 2: three scanned trees (two planned), layout says 4 trees, so one is unscanned.
/// Block B row 1: no records, layout says 2 trees, both unscanned.
/// Four planned trees are too few for least squares: the seconds-per-cut model is used,
/// ratios 60/10, 100/20, 40/5, 48/8 = 6, 5, 8, 6, mean 6.25 s per cut.
/// </summary>
internal static class EstimateExample
{
    /// <summary>Platform at 3.6 km/h = 1 m/s, 2 s to settle, 60 s per tree by hand.</summary>
    public static readonly EstimateSettings Settings = EstimateSettings.Default with
    {
        PlatformSpeedKmh = 3.6,
        SettleSecondsPerStop = 2,
        ManualSecondsPerTree = 60,
    };

    public static readonly RowLayout[] Rows =
    [
        new("A", "1", InRowSpacingM: 1.5, RowSpacingM: 3.5, RowLengthM: 100, TreesInRow: null),
        new("A", "2", InRowSpacingM: 2, RowSpacingM: 4, RowLengthM: 50, TreesInRow: 4),
        new("B", "1", InRowSpacingM: 1, RowSpacingM: 3, RowLengthM: 20, TreesInRow: 2),
    ];

    // (id, block, row, position, planned, seconds, scheduled, unreachable, moot, scan cuts, branch m, nodes)
    public static readonly TreeRecord[] Trees =
    [
        new("t1", "A", "1", 0, true, 60, 9, 1, 0, 10, 20, 100),
        new("t2", "A", "1", 1, true, 100, 18, 1, 1, 20, 40, 200),
        new("t5", "A", "1", 2, false, null, 0, 0, 0, 12, 30, 150),
        new("t3", "A", "2", 0, true, 40, 5, 0, 0, 5, 10, 50),
        new("t4", "A", "2", 1, true, 48, 7, 1, 0, 8, 16, 80),
        new("t6", "A", "2", 2, false, null, 0, 0, 0, 4, 8, 40),
    ];

    public static OrchardEstimate Compute() => EstimateCalculator.Compute(Trees, Rows, Settings);
}
