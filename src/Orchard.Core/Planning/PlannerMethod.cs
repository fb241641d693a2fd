using System.Text.Json.Serialization;

namespace Orchard.Core.Planning;

/// <summary>Which method found a move.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<PlannerMethod>))]
public enum PlannerMethod
{
    /// <summary>The straight joint-space segment was free: no planning needed.</summary>
    [JsonStringEnumMemberName("direct")] Direct,

    /// <summary>Recursive midpoint displacement, plain form (first free sample).</summary>
    [JsonStringEnumMemberName("plain")] Plain,

    /// <summary>Recursive midpoint displacement, cost-aware form (inverse-cost weighted mean of samples).</summary>
    [JsonStringEnumMemberName("cost-aware")] CostAware,

    /// <summary>Recursive midpoint displacement, greedy cost-aware form (best sample).</summary>
    [JsonStringEnumMemberName("greedy")] Greedy,

    /// <summary>RRT-Connect.</summary>
    [JsonStringEnumMemberName("rrt-connect")] RrtConnect,

    /// <summary>
    /// Two moves already found, joined through the pose between them (the arm passes that pose without
    /// cutting) and shortcut: for a pose the planners reach only from a few others.
    /// </summary>
    [JsonStringEnumMemberName("via")] Via,
}
