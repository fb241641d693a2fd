using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

[JsonConverter(typeof(JsonStringEnumConverter<ObstacleKind>))]
public enum ObstacleKind
{
    /// <summary>A trellis wire, running along the row.</summary>
    [JsonStringEnumMemberName("wire")] Wire,

    /// <summary>A trellis post or a tree stake.</summary>
    [JsonStringEnumMemberName("post")] Post,

    /// <summary>Anything else the scanner saw that the arm must not touch.</summary>
    [JsonStringEnumMemberName("other")] Other,
}
