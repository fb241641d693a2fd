using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>Which alley a stop is worked from.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<StopSide>))]
public enum StopSide
{
    /// <summary>The alley the scan was taken from (the tree frame's +y side).</summary>
    [JsonStringEnumMemberName("near")] Near,

    /// <summary>The alley on the other side of the row, worked on the platform's pass down it.</summary>
    [JsonStringEnumMemberName("far")] Far,
}
