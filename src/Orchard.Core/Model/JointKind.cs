using System.Text.Json.Serialization;

namespace Orchard.Core.Model;

[JsonConverter(typeof(JsonStringEnumConverter<JointKind>))]
public enum JointKind
{
    /// <summary>Turns about its axis; its values are radians.</summary>
    [JsonStringEnumMemberName("revolute")] Revolute,

    /// <summary>Slides along its axis (a lift or a rail); its values are metres.</summary>
    [JsonStringEnumMemberName("prismatic")] Prismatic,
}
