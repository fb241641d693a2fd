using Orchard.Store;

namespace Orchard.Service.Hosting;

/// <summary>PostgreSQL when a connection string is configured; else the embedded SQLite file in the data folder.</summary>
public static class StoreFactory
{
    public static IOrchardStore Create(OrchardOptions options, TimeProvider clock)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (!string.IsNullOrWhiteSpace(options.PostgresConnectionString))
        {
            return new PostgresStore(options.PostgresConnectionString, options.MaxClaimsPerJob);
        }

        if (options.WorkerProcesses > 1)
        {
            throw new InvalidOperationException("The embedded store serves one process; configure Orchard:PostgresConnectionString to run several worker processes.");
        }

        // The data folder is this user's only (0700) when made here; see SqliteStore for the files' modes.
        if (OperatingSystem.IsWindows())
        {
            Directory.CreateDirectory(options.DataFolder);
        }
        else
        {
            Directory.CreateDirectory(options.DataFolder, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
        }

        return new SqliteStore(Path.Combine(options.DataFolder, "orchard.db"), clock, options.MaxClaimsPerJob);
    }
}
