using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>Which alleys beside a row the platform can work it from.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<RowSides>))]
public enum RowSides
{
    /// <summary>From the alleys on both sides: far-side stops are made on the pass down the next alley.</summary>
    [JsonStringEnumMemberName("both")] Both,

    /// <summary>From the near alley only (a headland or a fence on the other side).</summary>
    [JsonStringEnumMemberName("near")] Near,
}
