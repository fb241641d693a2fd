using System.Text.Json.Serialization;

namespace Orchard.Store;

/// <summary>What the arm controller reports for one cut.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<CutOutcome>))]
public enum CutOutcome
{
    /// <summary>Made.</summary>
    [JsonStringEnumMemberName("done")] Done,

    /// <summary>Tried and not severed: the tree is re-planned from where the arm is.</summary>
    [JsonStringEnumMemberName("missed")] Missed,

    /// <summary>Left for a person.</summary>
    [JsonStringEnumMemberName("skipped")] Skipped,
}
