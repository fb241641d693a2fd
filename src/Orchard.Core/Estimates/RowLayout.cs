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
/// <param name="BothSides">
/// Whether the platform can work the row from the alleys on both of its sides. Stops on the far side of a
/// tree are made on the platform's pass down the next alley, so such a row costs a second pass when any
/// of its trees has a far-side stop; a row worked from one alley only never does.
/// </param>
public sealed record RowLayout(
    string BlockId,
    string RowId,
    double InRowSpacingM,
    double RowSpacingM,
    double RowLengthM,
    int? TreesInRow,
    bool BothSides = true)
{
    /// <summary>
    /// The layouts of a validated registry, block by block in its order: a row's own values, else its block's;
    /// the tree count, when left out, is the length over the tree spacing, rounded down.
    /// </summary>
    public static IReadOnlyList<RowLayout> FromRegistry(Model.RowRegistry registry)
    {
        ArgumentNullException.ThrowIfNull(registry);
        var layouts = new List<RowLayout>();
        foreach (var block in registry.Blocks)
        {
            foreach (var row in block.Rows)
            {
                var lengthM = row.LengthM ?? block.LengthM ?? throw Missing(block, row, "lengthM");
                var treeSpacingM = row.TreeSpacingM ?? block.TreeSpacingM ?? throw Missing(block, row, "treeSpacingM");
                var rowSpacingM = row.RowSpacingM ?? block.RowSpacingM ?? throw Missing(block, row, "rowSpacingM");
                var sides = row.Sides ?? block.Sides ?? throw Missing(block, row, "sides");
                layouts.Add(new RowLayout(
                    block.Id, row.Id, treeSpacingM, rowSpacingM, lengthM,
                    row.TreeCount ?? (int)Math.Floor(lengthM / treeSpacingM),
                    sides == Model.RowSides.Both));
            }
        }

        return layouts;
    }

    private static ArgumentException Missing(Model.RegistryBlock block, Model.RegistryRow row, string field) =>
        new($"Row {block.Id}/{row.Id} has no {field}; validate the registry first.", nameof(block));
}
