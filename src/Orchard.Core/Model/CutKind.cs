using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>Pruning cut kinds, as the trade names them.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<CutKind>))]
public enum CutKind
{
    /// <summary>Removes a branch where it joins its parent (everything beyond the cut goes).</summary>
    [JsonStringEnumMemberName("thinning")] Thinning,

    /// <summary>Shortens a branch part way along it.</summary>
    [JsonStringEnumMemberName("heading")] Heading,
}
