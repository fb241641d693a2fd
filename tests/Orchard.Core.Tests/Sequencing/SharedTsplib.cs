using System.Globalization;
using Orchard.Core.Sequencing.Tsplib;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// The TSPLIB copies in ../shared/data/tsplib beside the repository root (the folder holding Orchard.sln).
/// Tests that use this read ../shared; they fail with a plain message when it is not there.
/// Source of the files and optima: TSPLIB (Reinelt, ORSA J. Computing 3(4):376–384, 1991), as described in
/// ../shared/data/tsplib/README.md.
/// </summary>
internal static class SharedTsplib
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

        var tsplib = Path.GetFullPath(Path.Combine(dir.FullName, "..", "shared", "data", "tsplib"));
        return System.IO.Directory.Exists(tsplib) && File.Exists(Path.Combine(tsplib, "optima.csv"))
            ? tsplib
            : throw new InvalidOperationException(
                $"These tests read TSPLIB from ../shared/data/tsplib beside the repository root, and {tsplib} (with its optima.csv) is missing. " +
                "Lay the shared folder beside the checkout to run them.");
    }
}
