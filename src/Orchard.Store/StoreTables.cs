namespace Orchard.Store;

/// <summary>The tables both stores keep, in the order <see cref="IOrchardStore.CountRowsAsync"/> reports them, and shared names.</summary>
public static class StoreTables
{
    public static IReadOnlyList<string> All { get; } =
    [
        "arm_profiles", "api_keys", "trees", "scans", "jobs", "schedules", "plan_state", "outcomes", "idempotency",
        "review_sessions", "audit", "protection_keys",
        "orchard_documents", "tree_features", "cut_durations",
    ];

    /// <summary>A new id for a job the store itself creates (a re-plan after a missed cut).</summary>
    public static string NewReplanJobId() => "job-" + Guid.CreateVersion7().ToString("N");
}
