using System.Globalization;
using Orchard.Core.Estimates;

namespace Orchard.Core.Tests.Estimates;

public sealed class EstimateCsvTests
{
    [Fact]
    public void Header_then_rows_then_their_block_then_the_total()
    {
        var lines = EstimateCsv.Write(EstimateExample.Compute()).Split('\n');
        Assert.Equal(8, lines.Length); // header + 3 rows + 2 blocks + total, then the empty string after the final LF
        Assert.Equal(string.Empty, lines[^1]);
        Assert.Equal(EstimateCsv.Header, lines[0]);
        string[] levels = ["row", "row", "block", "row", "block", "total"];
        Assert.Equal(levels, lines[1..7].Select(l => l.Split(',')[0]));
        var columns = EstimateCsv.Header.Split(',').Length;
        Assert.All(lines[1..7], l => Assert.Equal(columns, l.Split(',').Length));
    }

    [Fact]
    public void Row_line_carries_the_hand_computed_values_in_invariant_format()
    {
        var header = EstimateCsv.Header.Split(',');
        var fields = EstimateCsv.Write(EstimateExample.Compute()).Split('\n')[1].Split(',');
        string F(string name) => fields[Array.IndexOf(header, name)];

        Assert.Equal("A", F("block"));
        Assert.Equal("1", F("row"));
        Assert.Equal("3", F("trees"));
        Assert.Equal("160", F("planned_arm_s"));
        Assert.Equal("75", F("predicted_arm_s"));
        Assert.Equal("9", F("move_s"));
        Assert.Equal("244", F("total_s"));
        Assert.Equal("0.067778", F("total_h"));       // 244 / 3600 to six decimals
        Assert.Equal("0.035", F("area_ha"));
        Assert.Equal("1.936508", F("hours_per_ha"));  // 0.0677778 / 0.035
        Assert.Equal("SecondsPerCut", F("model"));
    }

    [Fact]
    public void Undefined_values_are_empty_and_ids_with_commas_are_quoted()
    {
        var rows = new[] { new RowLayout("North, \"upper\"", "1", 1, 3, 10, 1) };
        var csv = EstimateCsv.Write(EstimateCalculator.Compute([], rows, EstimateSettings.Default));
        var rowLine = csv.Split('\n')[1];
        Assert.StartsWith("row,\"North, \"\"upper\"\"\",1,1,", rowLine, StringComparison.Ordinal);

        // The only tree is unscanned and nothing is planned: a guess, so no half-width and no upper bound.
        var header = EstimateCsv.Header.Split(',');
        var total = csv.Split('\n')[^2].Split(',');
        Assert.Equal("total", total[0]);
        Assert.Equal(string.Empty, total[Array.IndexOf(header, "predicted_arm_halfwidth_s")]);
        Assert.Equal(string.Empty, total[Array.IndexOf(header, "total_h_high")]);
        Assert.Equal("DefaultGuess", total[^1]);
    }

    [Fact]
    public void Empty_estimate_writes_the_header_and_a_zero_total()
    {
        var csv = EstimateCsv.Write(EstimateCalculator.Compute([], [], EstimateSettings.Default));
        Assert.Equal(EstimateCsv.Header + "\ntotal,,,0,0,0,0,0,0,0,0,0,0,0,0,0,,,,,0,0,,0,0,0,DefaultGuess\n", csv);
    }
}
