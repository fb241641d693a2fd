using System.Text.Json.Serialization;

namespace Orchard.Core.Sequencing;

/// <summary>What a re-plan does with a missed cut.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<RetryPolicy>))]
public enum RetryPolicy
{
    /// <summary>Try it again before anything else.</summary>
    [JsonStringEnumMemberName("retryNow")] RetryNow,

    /// <summary>Try it again after every other remaining cut of the stop where it was missed, before the platform moves on.</summary>
    [JsonStringEnumMemberName("retryLast")] RetryLast,

    /// <summary>Leave it for a person; it is reported as dropped.</summary>
    [JsonStringEnumMemberName("drop")] Drop,
}
