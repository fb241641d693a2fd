using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Serialization;

namespace Orchard.Service.Tests;

/// <summary>Demo scans as a tablet would post them (trimmed to a few cuts so planning stays quick).</summary>
internal static class DemoScans
{
    public static TreeScan Tree(int index, int cuts = 8)
    {
        var scan = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 2)).Trees[index].Scan;
        return scan with { Cuts = scan.Cuts.Take(cuts).ToArray() };
    }

    public static string Json(int index, int cuts = 8) => OrchardJson.Serialize(Tree(index, cuts));

    /// <summary>The row names of the given demo trees.</summary>
    public static string[] Names(params int[] indices) => indices.Select(i => Tree(i).Row).ToArray();
}
