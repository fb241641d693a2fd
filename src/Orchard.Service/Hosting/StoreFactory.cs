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

        return new SqliteStore(EmbeddedStoreFile(options), clock, options.MaxClaimsPerJob);
    }

    /// <summary>
    /// The embedded store's file: DataFolder/orchard.db, a relative folder taken from the current folder (where
    /// the user ran the command). The folder is made when missing, this user's only (0700; see SqliteStore for
    /// the files' modes); a failure names the full path.
    /// </summary>
    public static string EmbeddedStoreFile(OrchardOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var folder = Path.GetFullPath(options.DataFolder);
        try
        {
            if (OperatingSystem.IsWindows())
            {
                Directory.CreateDirectory(folder);
            }
            else
            {
                Directory.CreateDirectory(folder, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
            }
        }
        catch (Exception ex) when (ex is UnauthorizedAccessException or IOException)
        {
            throw new InvalidOperationException($"The embedded store's folder {folder} (Orchard:DataFolder) cannot be made: {ex.Message}", ex);
        }

        return Path.Combine(folder, "orchard.db");
    }
}
