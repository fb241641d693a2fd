namespace Orchard.Core.Model;

/// <summary>A point of the branch graph, in the tree frame, metres.</summary>
/// <param name="Id">Unique within the scan.</param>
/// <param name="XM">Along the row.</param>
/// <param name="YM">Across the row, positive towards the aisle the platform drives in.</param>
/// <param name="ZM">Up from the trunk base.</param>
public sealed record ScanNode(string Id, double XM, double YM, double ZM);
