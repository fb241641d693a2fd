using System.Globalization;
using Orchard.Core.Sequencing.Tsplib;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// The TSPLIB copies kept in the repository, tests/data/tsplib (found above the test assembly by the folder
/// holding Orchard.sln), so a clone with nothing beside it runs these tests. Source of the files and optima:
/// TSPLIB (Reinelt, ORSA J. Computing 3(4):376–384, 1991), as tests/data/tsplib/README.md says.
/// </summary>
internal static class RepositoryTsplib
{
    private static readonly Lazy<string> Folder = new(Locate);

    public static string Directory => Folder.Value;

    public static TsplibInstance Instance(string name)
    {
        var path = Path.Combine(Directory, name + (File.Exists(Path.Combine(Directory, name + ".tsp")) ? ".tsp" : ".atsp"));
        return TsplibParser.Parse(File.ReadAllText(path));
    }

    /// <summary>optima.csv: instance → proven optimal closed-tour length.</summary>
    public static IReadOnlyDictionary<string, long> Optima() =>
        File.ReadAllLines(Path.Combine(Directory, "optima.csv"))
            .Skip(1)
            .Where(l => l.Trim().Length > 0)
            .Select(l => l.Split(','))
            .ToDictionary(p => p[0].Trim(), p => long.Parse(p[1].Trim(), CultureInfo.InvariantCulture), StringComparer.Ordinal);

    private static string Locate()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Orchard.sln")))
        {
            dir = dir.Parent;
        }

        if (dir is null)
        {
            throw new InvalidOperationException($"Could not find the repository root (the folder holding Orchard.sln) above {AppContext.BaseDirectory}.");
        }

        var tsplib = Path.Combine(dir.FullName, "tests", "data", "tsplib");
        return File.Exists(Path.Combine(tsplib, "optima.csv"))
            ? tsplib
            : throw new InvalidOperationException($"The repository's TSPLIB copies are missing: {Path.Combine(tsplib, "optima.csv")} does not exist.");
    }
}
