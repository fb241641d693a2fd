using Orchard.Core.Model;

namespace Orchard.Core.Demo;

/// <summary>
/// The demo trellis: four high-tensile wires along the row and a wooden post every 12 m, starting at
/// the row's end. Wires at 0.9, 1.6, 2.3 and 3.0 m, 2.5 mm thick (12.5-gauge wire); posts 120 mm
/// thick and 3.3 m tall (common practice for tall-spindle trellises).
/// </summary>
internal static class TrellisLayout
{
    private static readonly double[] WireHeightsM = [0.9, 1.6, 2.3, 3.0];
    private const double WireRadiusM = 0.00125;
    private const double WireOffsetYM = -0.06;
    private const double PostSpacingM = 12.0;
    private const double PostRadiusM = 0.06;
    private const double PostHeightM = 3.3;

    /// <summary>The scan sees this far either side of the trunk along the row, metres.</summary>
    public const double ScanHalfWidthM = 1.5;

    public static IReadOnlyList<Obstacle> ObstaclesNear(DemoRow row, int positionInRow)
    {
        var obstacles = new List<Obstacle>();
        for (var w = 0; w < WireHeightsM.Length; w++)
        {
            obstacles.Add(new Obstacle($"wire-{w + 1}", ObstacleKind.Wire,
                new Vector3M(-ScanHalfWidthM, WireOffsetYM, WireHeightsM[w]), new Vector3M(ScanHalfWidthM, WireOffsetYM, WireHeightsM[w]), WireRadiusM));
        }

        // The tree stands at (position − ½) × spacing from the row's end.
        var treeAlongRowM = (positionInRow - 0.5) * row.InRowSpacingM;
        var firstPost = (int)Math.Ceiling((treeAlongRowM - ScanHalfWidthM) / PostSpacingM);
        for (var k = Math.Max(0, firstPost); k * PostSpacingM <= treeAlongRowM + ScanHalfWidthM; k++)
        {
            var x = Math.Round((k * PostSpacingM) - treeAlongRowM, 4);
            obstacles.Add(new Obstacle($"post-{k}", ObstacleKind.Post, new Vector3M(x, WireOffsetYM, 0), new Vector3M(x, WireOffsetYM, PostHeightM), PostRadiusM));
        }

        return obstacles;
    }
}
