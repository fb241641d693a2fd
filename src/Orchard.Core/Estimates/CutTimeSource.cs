using System.Text.Json.Serialization;

namespace Orchard.Core.Estimates;

/// <summary>Where a block's cut times come from.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<CutTimeSource>))]
public enum CutTimeSource
{
    /// <summary>The arm profile's cut-time model, as planned (too few measured cuts, or none).</summary>
    [JsonStringEnumMemberName("armProfile")] ArmProfile,

    /// <summary>A least-squares line through the cut durations the controller measured in the block.</summary>
    [JsonStringEnumMemberName("measured")] Measured,
}
