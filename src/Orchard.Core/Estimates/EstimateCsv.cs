using System.Globalization;
using System.Text;

namespace Orchard.Core.Estimates;

/// <summary>
/// The estimate as CSV (RFC 4180 quoting, invariant culture, LF line ends): a header, one line per row,
/// then one per block after its rows, then the orchard total. Numbers carry at most six decimals;
/// undefined values (a rate over zero, an interval the model cannot give) are empty fields.
/// </summary>
public static class EstimateCsv
{
    public const string Header =
        "level,block,row,trees,planned_trees,not_planned_trees,unscanned_trees,planned_arm_s,predicted_arm_s," +
        "predicted_arm_halfwidth_s,move_s,total_s,total_h,total_h_low,total_h_high,area_ha,hours_per_ha," +
        "hours_per_row,trees_per_h,cuts_per_h,unreachable_cuts,manual_person_h,robot_h_per_manual_person_h," +
        "hand_cuts,hand_person_h,alley_passes,model";

    public static string Write(OrchardEstimate estimate)
    {
        ArgumentNullException.ThrowIfNull(estimate);
        var model = estimate.Model.Kind.ToString();
        var sb = new StringBuilder();
        sb.Append(Header).Append('\n');
        foreach (var block in estimate.Blocks)
        {
            foreach (var row in block.Rows)
            {
                Line(sb, "row", row.BlockId, row.RowId, row.Totals, model);
            }

            Line(sb, "block", block.BlockId, string.Empty, block.Totals, model);
        }

        Line(sb, "total", string.Empty, string.Empty, estimate.Totals, model);
        return sb.ToString();
    }

    private static void Line(StringBuilder sb, string level, string block, string row, EstimateTotals t, string model)
    {
        string[] fields =
        [
            level,
            Text(block),
            Text(row),
            Number(t.TreeCount),
            Number(t.PlannedTrees),
            Number(t.NotPlannedTrees),
            Number(t.UnscannedTrees),
            Number(t.PlannedArmSeconds),
            Number(t.PredictedArm.Seconds),
            Number(t.PredictedArm.HalfWidthSeconds),
            Number(t.MoveSeconds),
            Number(t.TotalSeconds),
            Number(t.TotalHours),
            Number(t.TotalHoursLow),
            Number(t.TotalHoursHigh),
            Number(t.AreaHa),
            Number(t.HoursPerHectare),
            Number(t.HoursPerRow),
            Number(t.TreesPerHour),
            Number(t.CutsPerHour),
            Number(t.UnreachableCuts),
            Number(t.ManualPersonHours),
            Number(t.RobotHoursPerManualPersonHour),
            Number(t.HandCuts),
            Number(t.HandPersonHours),
            Number(t.AlleyPasses),
            model,
        ];
        sb.AppendJoin(',', fields).Append('\n');
    }

    private static string Number(double? value) =>
        value is { } v && double.IsFinite(v) ? v.ToString("0.######", CultureInfo.InvariantCulture) : string.Empty;

    private static string Text(string value) =>
        value.AsSpan().IndexOfAny(",\"\r\n") >= 0 ? "\"" + value.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"" : value;
}
