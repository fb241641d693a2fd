namespace Orchard.Service.Hosting;

/// <summary>The service's settings (configuration section <c>Orchard</c>; environment variables <c>Orchard__Name</c>).</summary>
public sealed class OrchardOptions
{
    public const string Section = "Orchard";

    /// <summary>PostgreSQL connection string; empty means the embedded SQLite store.</summary>
    public string? PostgresConnectionString { get; set; }

    /// <summary>Folder of the embedded store [./data].</summary>
    public string DataFolder { get; set; } = "data";

    /// <summary>An admin key to register at start (its secret); when empty and no key exists, one is made and printed once.</summary>
    public string? BootstrapAdminKey { get; set; }

    /// <summary>Planning workers in this process [1].</summary>
    public int Workers { get; set; } = 1;

    /// <summary>How many worker processes share the store; the embedded store refuses more than one [1].</summary>
    public int WorkerProcesses { get; set; } = 1;

    /// <summary>Claims of one job before the queue gives it up as failed (see JobClaimLimit) [20].</summary>
    public int MaxClaimsPerJob { get; set; } = Orchard.Store.JobClaimLimit.Default;

    /// <summary>A claimed job's lease, renewed at a third of it while planning [30 s].</summary>
    public int LeaseSeconds { get; set; } = 30;

    /// <summary>Largest request body [8 MiB]: a 20,000-branch scan is about 3 MB of JSON.</summary>
    public long MaxBodyBytes { get; set; } = 8 * 1024 * 1024;

    /// <summary>Least level logged: Verbose, Debug, Information, Warning, Error [Information].</summary>
    public string LogLevel { get; set; } = "Information";

    /// <summary>Measured cuts a block needs before its own cut-time line replaces the arm profile's in the estimates [20].</summary>
    public int MinimumMeasuredCutsPerBlock { get; set; } = Orchard.Core.Estimates.CutTimeFitSettings.Default.MinimumCuts;

    /// <summary>Requests per key per minute before 429 [1,200].</summary>
    public int RequestsPerMinute { get; set; } = 1200;

    /// <summary>
    /// Plan jobs one key may have queued or running; a scan or a missed cut past it gets 429 with Retry-After
    /// [50: a tablet scanning a row stays far below it while workers keep up; it bounds what one key can
    /// queue at about 50 plans, however fast it posts].
    /// </summary>
    public int MaxOpenJobsPerKey { get; set; } = 50;

    /// <summary>The Retry-After of that 429 [30 s].</summary>
    public int QuotaRetryAfterSeconds { get; set; } = 30;

    /// <summary>Requests per minute from one client address without a key or session (the page's files, sign-in) [300].</summary>
    public int AnonymousRequestsPerMinute { get; set; } = 300;

    /// <summary>Failed authentications (unknown, revoked or expired keys, failed sign-ins) per client address per minute before it is blocked for the rest of the minute [20].</summary>
    public int FailedAuthPerMinute { get; set; } = 20;

    /// <summary>How long a review-page session lasts, at most (never renewed, never past its key's expiry) [8 h].</summary>
    public double SessionHours { get; set; } = 8;

    /// <summary>
    /// Planning time of one job: past it, the planner stops and the schedule planned so far is stored, marked
    /// partial, with the reason [120 s; a 40-cut demo tree plans in a few seconds]. 0 turns it off. A job
    /// still running at twice this plus 30 s is stopped by the worker and failed with the reason.
    /// </summary>
    public double PlanningDeadlineSeconds { get; set; } = 120;

    /// <summary>
    /// Whether moves may pass through space that earlier cuts free (named per move in <c>dependsOnCuts</c>) [true].
    /// False plans this orchard's trees against the whole tree, assuming no wood falls: for wood that hangs in
    /// the trellis after it is cut. Costs cuts that only freed space reaches (<c>bench coverage --no-falling-wood</c>).
    /// </summary>
    public bool AssumeFallingWood { get; set; } = true;

    /// <summary>
    /// A port of its own for <c>/metrics</c> (anonymous there, and nothing else is served there), for a scraper
    /// inside the cluster; keep it out of the public Service. Unset: <c>/metrics</c> is on the service's port and
    /// needs an admin key [unset].
    /// </summary>
    public int? MetricsPort { get; set; }
}
