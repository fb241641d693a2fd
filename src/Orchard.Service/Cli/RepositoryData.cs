namespace Orchard.Service.Cli;

/// <summary>
/// Data kept in the repository beside the code (tests/data), found from where the user runs the command
/// and, failing that, from where the executable lives: either way inside a checkout.
/// </summary>
internal static class RepositoryData
{
    /// <summary>tests/data/tsplib below the checkout holding the current folder or the executable; null outside one.</summary>
    public static string? TsplibFolder() =>
        new[] { Environment.CurrentDirectory, AppContext.BaseDirectory }
            .Select(FindCheckout)
            .Where(root => root is not null)
            .Select(root => Path.Combine(root!, "tests", "data", "tsplib"))
            .FirstOrDefault(folder => File.Exists(Path.Combine(folder, "optima.csv")));

    private static string? FindCheckout(string start)
    {
        for (var dir = new DirectoryInfo(start); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "Orchard.sln")))
            {
                return dir.FullName;
            }
        }

        return null;
    }
}
