using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>Why a cut is not a step of a schedule, broadly; <see cref="UnscheduledReason"/> says more.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<UnscheduledStatus>))]
public enum UnscheduledStatus
{
    /// <summary>The controller reported it made.</summary>
    [JsonStringEnumMemberName("done")] Done,

    /// <summary>Left for a person (reported skipped, or missed under the drop policy).</summary>
    [JsonStringEnumMemberName("dropped")] Dropped,

    /// <summary>Another cut removes its wood.</summary>
    [JsonStringEnumMemberName("moot")] Moot,

    /// <summary>The machine cannot make it from any stop tried: for the hand crew.</summary>
    [JsonStringEnumMemberName("unreachable")] Unreachable,

    /// <summary>Planning stopped (a deadline) before it was looked at.</summary>
    [JsonStringEnumMemberName("notPlanned")] NotPlanned,
}
