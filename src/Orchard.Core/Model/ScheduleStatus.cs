using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>How a schedule's planning ended.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<ScheduleStatus>))]
public enum ScheduleStatus
{
    /// <summary>Planning finished: every cut is a step or is listed as unscheduled with its reason.</summary>
    [JsonStringEnumMemberName("complete")] Complete,

    /// <summary>Planning stopped early (a deadline); the steps are sound, the rest is listed with the reason.</summary>
    [JsonStringEnumMemberName("partial")] Partial,

    /// <summary>Cuts were eligible, yet none could be scheduled; <see cref="Schedule.Problems"/> says why.</summary>
    [JsonStringEnumMemberName("nothingScheduled")] NothingScheduled,
}
