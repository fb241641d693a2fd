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
}
