using System.Text.Json.Serialization;

namespace Orchard.Store;

/// <summary>Where a plan job stands. Done, failed and superseded are final.</summary>
[JsonConverter(typeof(JsonStringEnumConverter<JobStatus>))]
public enum JobStatus
{
    /// <summary>Waiting for a worker.</summary>
    [JsonStringEnumMemberName("queued")] Queued,

    /// <summary>A worker holds its lease and plans it.</summary>
    [JsonStringEnumMemberName("running")] Running,

    /// <summary>Its schedule was written as the tree's current version.</summary>
    [JsonStringEnumMemberName("done")] Done,

    /// <summary>Planning failed (the reason is kept) or the queue gave it up.</summary>
    [JsonStringEnumMemberName("failed")] Failed,

    /// <summary>
    /// Its scan was replaced by a newer scan of the tree, or the version it re-plans was no longer current,
    /// before its result could be written: nothing it planned became current.
    /// </summary>
    [JsonStringEnumMemberName("superseded")] Superseded,
}
