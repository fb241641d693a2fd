using System.Text.Json.Serialization;

namespace Orchard.Core.Sequencing;

/// <summary>What to do with a cut whose wood another cut removes anyway.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<MootPolicy>))]
public enum MootPolicy
{
    /// <summary>Leave it out and report it as moot: the nearer cut takes its wood off (the default).</summary>
    [JsonStringEnumMemberName("drop")] Drop,

    /// <summary>Make it first (before the cut that would remove it), e.g. to bring a heavy limb down in pieces.</summary>
    [JsonStringEnumMemberName("cutFirst")] CutFirst,
}
