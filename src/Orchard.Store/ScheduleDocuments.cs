using System.Text.Json.Nodes;
using Orchard.Core.Serialization;

namespace Orchard.Store;

/// <summary>The store owns versions: at commit it writes the version it assigns into the schedule document.</summary>
internal static class ScheduleDocuments
{
    /// <summary>The document with its top-level <c>version</c> member set (added when absent), other members untouched.</summary>
    public static string WithVersion(string scheduleJson, int version)
    {
        var node = JsonNode.Parse(scheduleJson) as JsonObject
            ?? throw new ArgumentException("A schedule document must be a JSON object.", nameof(scheduleJson));
        node["version"] = version;
        return node.ToJsonString(OrchardJson.Options);
    }
}
