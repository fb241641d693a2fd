namespace Orchard.Core.Demo;

/// <summary>A row of the demo orchard and its spacing.</summary>
/// <param name="InRowSpacingM">Tree to tree along the row.</param>
/// <param name="RowSpacingM">Row centre to row centre.</param>
/// <param name="RowLengthM">The whole row, of which the demo scans the first trees.</param>
public sealed record DemoRow(string Block, string Name, double InRowSpacingM, double RowSpacingM, double RowLengthM);
