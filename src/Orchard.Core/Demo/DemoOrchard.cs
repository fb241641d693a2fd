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

    public IEnumerable<string> Blocks => Rows.Select(r => r.Block).Distinct();

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
