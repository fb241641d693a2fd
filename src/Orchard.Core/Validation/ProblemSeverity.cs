using System.Text.Json.Serialization;

namespace Orchard.Core.Validation;

[JsonConverter(typeof(JsonStringEnumConverter<ProblemSeverity>))]
public enum ProblemSeverity
{
    /// <summary>The document cannot be planned; it is refused.</summary>
    [JsonStringEnumMemberName("error")] Error,

    /// <summary>The document is accepted, but something is outside what the trade expects.</summary>
    [JsonStringEnumMemberName("warning")] Warning,
}
