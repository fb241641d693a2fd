using System.Text.Json.Serialization;

namespace Orchard.Core.Reachability;

/// <summary>Why no approach to a cut can be used.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<UnreachableReason>))]
public enum UnreachableReason
{
    /// <summary>The wood is thicker than the shear is rated for.</summary>
    [JsonStringEnumMemberName("aboveShearRating")] AboveShearRating,

    /// <summary>The arm cannot bring the shear near the cut from where the platform stands.</summary>
    [JsonStringEnumMemberName("outOfReach")] OutOfReach,

    /// <summary>The shear gets near the cut, but no joint solution within the limits holds the cut pose.</summary>
    [JsonStringEnumMemberName("jointLimits")] JointLimits,

    /// <summary>Joint solutions exist, but each collides: at the cut, at the pre-cut pose or on the approach.</summary>
    [JsonStringEnumMemberName("collision")] Collision,
}
