using System.Text.Json.Serialization;

namespace Orchard.Core.Sequencing;

/// <summary>How move costs are found for the ordering.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<EvaluationMode>))]
public enum EvaluationMode
{
    /// <summary>Solve on lower bounds, plan only the moves the tour uses, repeat until the tour uses only planned moves.</summary>
    [JsonStringEnumMemberName("lazy")] Lazy,

    /// <summary>Plan every move between every pair of candidates first, then solve once.</summary>
    [JsonStringEnumMemberName("allPairs")] AllPairs,
}
