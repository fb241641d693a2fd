namespace Orchard.Core.Model;

/// <summary>
/// The orchard's blocks and rows as the estimates need them: each row's length, tree spacing, row spacing,
/// alley width and the sides it is worked from. Kept in the store, written by an admin
/// (<c>PUT /api/v1/rows</c>).
/// </summary>
public sealed record RowRegistry(IReadOnlyList<RegistryBlock> Blocks)
{
    public static RowRegistry Empty { get; } = new([]);
}
