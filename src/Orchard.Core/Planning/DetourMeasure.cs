using System.Text.Json.Serialization;

namespace Orchard.Core.Planning;

/// <summary>How the cost-aware midpoint measures a detour: in travel time or in distance.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<DetourMeasure>))]
public enum DetourMeasure
{
    /// <summary>The space's rest-to-rest travel time (s): what the slowest joint takes.</summary>
    TravelTime,

    /// <summary>The space's distance (joint units).</summary>
    Distance,
}
