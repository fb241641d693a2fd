using Orchard.Core.Model;

namespace Orchard.Core.Estimates;

/// <summary>What the estimates need of a tree's scan, worked out once when the scan is accepted.</summary>
/// <param name="CutCount">Cuts marked on the scan.</param>
/// <param name="BranchLengthM">Summed length of every branch, metres: the tree's size.</param>
/// <param name="NodeCount">Nodes of the branch graph.</param>
public sealed record ScanFeatures(int CutCount, double BranchLengthM, int NodeCount)
{
    /// <summary>The features of a validated scan.</summary>
    public static ScanFeatures Of(TreeScan scan)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var nodes = new Dictionary<string, ScanNode>(scan.Nodes.Count, StringComparer.Ordinal);
        foreach (var node in scan.Nodes)
        {
            nodes[node.Id] = node;
        }

        var lengthM = 0.0;
        foreach (var branch in scan.Branches)
        {
            if (nodes.TryGetValue(branch.FromNode, out var f) && nodes.TryGetValue(branch.ToNode, out var t))
            {
                lengthM += Math.Sqrt(((t.XM - f.XM) * (t.XM - f.XM)) + ((t.YM - f.YM) * (t.YM - f.YM)) + ((t.ZM - f.ZM) * (t.ZM - f.ZM)));
            }
        }

        return new ScanFeatures(scan.Cuts.Count, lengthM, scan.Nodes.Count);
    }
}
