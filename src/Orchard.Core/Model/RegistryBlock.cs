namespace Orchard.Core.Model;

/// <summary>
/// A block of the row registry: its rows, and values its rows share unless a row gives its own (see
/// <see cref="RegistryRow"/> for their meaning).
/// </summary>
public sealed record RegistryBlock(
    string Id,
    IReadOnlyList<RegistryRow> Rows,
    double? LengthM = null,
    double? TreeSpacingM = null,
    double? RowSpacingM = null,
    double? AlleyWidthM = null,
    RowSides? Sides = null);
