namespace Orchard.Core.Demo;

/// <summary>
/// The invented demo orchard: a farm, its blocks and rows, and the scanned trees. Every name here is
/// made up for the demo (no real farm, place, person or brand).
/// </summary>
public sealed record DemoOrchard(string FarmName, IReadOnlyList<DemoRow> Rows, IReadOnlyList<DemoTree> Trees)
{
    public const string InventedFarmName = "Ottermere Fruit Terraces";

    /// <summary>
    /// Two blocks, three rows each. Spacing is tall-spindle style: 0.9–1.2 m in the row and 3.4–3.7 m
    /// between rows (the ranges the trade uses for tall-spindle apple plantings; common practice).
    /// </summary>
    private static readonly DemoRow[] RowPlan =
    [
        new("Kestrel Terrace", "K1", 0.90, 3.50, 180),
        new("Kestrel Terrace", "K2", 0.90, 3.50, 180),
        new("Kestrel Terrace", "K3", 0.90, 3.50, 172),
        new("Wren Hollow", "W1", 1.10, 3.65, 150),
        new("Wren Hollow", "W2", 1.10, 3.65, 150),
        new("Wren Hollow", "W3", 1.20, 3.65, 144),
    ];

    /// <summary>The canopy of a tall-spindle wall is about a metre wide (common practice); the alley is the rest of the row spacing.</summary>
    public const double CanopyWidthM = 1.0;

    public IEnumerable<string> Blocks => Rows.Select(r => r.Block).Distinct();

    /// <summary>
    /// The orchard's rows as a row registry (what <c>PUT /api/v1/rows</c> takes): spacing per block, length per
    /// row, every row worked from both alleys.
    /// </summary>
    public Model.RowRegistry Registry() => new(
        Rows.GroupBy(r => r.Block)
            .Select(block => new Model.RegistryBlock(
                block.Key,
                block.Select(r => new Model.RegistryRow(
                    r.Name,
                    LengthM: r.RowLengthM,
                    TreeSpacingM: r.InRowSpacingM == block.First().InRowSpacingM ? null : r.InRowSpacingM)).ToArray(),
                TreeSpacingM: block.First().InRowSpacingM,
                RowSpacingM: block.First().RowSpacingM,
                AlleyWidthM: Math.Round(block.First().RowSpacingM - CanopyWidthM, 2),
                Sides: Model.RowSides.Both))
            .ToArray());

    /// <summary>Makes the orchard; the same settings always give the same trees.</summary>
    public static DemoOrchard Generate(DemoOrchardSettings? settings = null)
    {
        settings ??= new DemoOrchardSettings();
        ArgumentOutOfRangeException.ThrowIfLessThan(settings.TreesPerRow, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(settings.TreesPerRow, DemoOrchardSettings.MaxTreesPerRow);

        var trees = new List<DemoTree>(RowPlan.Length * settings.TreesPerRow);
        var stream = 0UL;
        foreach (var row in RowPlan)
        {
            for (var position = 1; position <= settings.TreesPerRow; position++)
            {
                var scan = DemoTreeGenerator.Generate(row, position, settings.Seed, stream++);
                trees.Add(new DemoTree(row, scan));
            }
        }

        return new DemoOrchard(InventedFarmName, RowPlan, trees);
    }
}
