namespace Orchard.Store;

/// <summary>
/// How often one job may be claimed before the queue gives up on it. A job whose lease keeps running out
/// is killing its workers (out of memory, a crash in planning) or is being killed with them; claiming it
/// forever would take worker after worker down with it. At the limit, the next claim finds its lease
/// expired and marks it failed with <see cref="Reason"/> instead: visible on GET /jobs/{id}, and a new
/// scan of the tree is a new job.
/// </summary>
public static class JobClaimLimit
{
    /// <summary>Claims (first one, take-overs and re-claims after a release on shutdown) before a job is given up [20].</summary>
    public const int Default = 20;

    public static string Reason(int claims) =>
        $"Abandoned after {claims} claims: the workers planning it stopped each time before finishing (crash, out of memory or killed). Post the scan again to retry.";
}
