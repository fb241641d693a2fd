using System.Text.Json.Serialization;

namespace Orchard.Store;

/// <summary>What a plan job does: plan a new scan, or re-plan the current schedule after a missed cut.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<JobKind>))]
public enum JobKind
{
    [JsonStringEnumMemberName("plan")] Plan,
    [JsonStringEnumMemberName("replan")] Replan,
}
