using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>A point of the branch graph, in the tree frame, metres.</summary>
/// <param name="Id">Unique within the scan.</param>
/// <param name="XM">Along the row (JSON <c>xM</c>).</param>
/// <param name="YM">Across the row, positive towards the aisle the platform drives in (JSON <c>yM</c>).</param>
/// <param name="ZM">Up from the trunk base (JSON <c>zM</c>).</param>
public sealed record ScanNode(
    string Id,
    [property: JsonPropertyName("xM")] double XM,
    [property: JsonPropertyName("yM")] double YM,
    [property: JsonPropertyName("zM")] double ZM);
