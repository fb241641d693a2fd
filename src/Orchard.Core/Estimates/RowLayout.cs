namespace Orchard.Core.Estimates;

/// <summary>Geometry of one trellis row.</summary>
/// <param name="BlockId">Block of the row.</param>
/// <param name="RowId">Row id, unique within its block.</param>
/// <param name="InRowSpacingM">Distance between neighbouring trees along the row: the platform moves this far per tree.</param>
/// <param name="RowSpacingM">Distance between this row and the next (alley centre to alley centre).</param>
/// <param name="RowLengthM">Planted length of the row. The row's area is <c>RowLengthM × RowSpacingM</c>.</param>
/// <param name="TreesInRow">
/// Trees standing in the row when known; trees beyond the scanned ones count as unscanned. When null,
/// the row has exactly the trees present in the records.
/// </param>
public sealed record RowLayout(
    string BlockId,
    string RowId,
    double InRowSpacingM,
    double RowSpacingM,
    double RowLengthM,
    int? TreesInRow);
