namespace Orchard.Core.Model;

/// <summary>
/// One row of the row registry. A value left out is taken from the row's block.
/// </summary>
/// <param name="Id">Row id, unique within its block (the <c>row</c> of the scans).</param>
/// <param name="LengthM">Planted length of the row, metres.</param>
/// <param name="TreeSpacingM">Tree to tree along the row, metres: the platform's move per tree.</param>
/// <param name="RowSpacingM">Row centre to row centre, metres: the row's area is length × row spacing.</param>
/// <param name="AlleyWidthM">The clear alley beside the row the platform drives in, metres (at most the row spacing).</param>
/// <param name="Sides">Which alleys the row can be worked from.</param>
/// <param name="TreeCount">Trees standing in the row; when left out, the length over the tree spacing, rounded down.</param>
public sealed record RegistryRow(
    string Id,
    double? LengthM = null,
    double? TreeSpacingM = null,
    double? RowSpacingM = null,
    double? AlleyWidthM = null,
    RowSides? Sides = null,
    int? TreeCount = null);
