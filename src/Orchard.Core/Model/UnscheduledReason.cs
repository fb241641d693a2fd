using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

/// <summary>The particular reason behind an <see cref="UnscheduledStatus"/>.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<UnscheduledReason>))]
public enum UnscheduledReason
{
    /// <summary>The wood is thicker than the shear is rated for.</summary>
    [JsonStringEnumMemberName("aboveShearRating")] AboveShearRating,

    /// <summary>The shear cannot be brought to the cut from any stop tried.</summary>
    [JsonStringEnumMemberName("outOfReach")] OutOfReach,

    /// <summary>The shear gets there, but no joint solution within the limits holds the cut pose.</summary>
    [JsonStringEnumMemberName("jointLimits")] JointLimits,

    /// <summary>Every approach touches wood, trellis, ground or the arm itself.</summary>
    [JsonStringEnumMemberName("collision")] Collision,

    /// <summary>Approaches exist, but no collision-free move to one was found within the planning budget.</summary>
    [JsonStringEnumMemberName("noMove")] NoMove,

    /// <summary>Another cut removes its wood.</summary>
    [JsonStringEnumMemberName("removedByCut")] RemovedByCut,

    /// <summary>Planning stopped before this cut was scheduled.</summary>
    [JsonStringEnumMemberName("planningStopped")] PlanningStopped,
}
