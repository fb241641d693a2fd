namespace Orchard.Core.Estimates;

/// <summary>What the time model knows of a tree before it is planned.</summary>
/// <param name="ScanCuts">Cuts the pruning rules chose on the scan.</param>
/// <param name="SizeM">Total branch length of the scan.</param>
public sealed record TreeFeatures(double ScanCuts, double SizeM)
{
    public static TreeFeatures Of(TreeRecord tree)
    {
        ArgumentNullException.ThrowIfNull(tree);
        return new TreeFeatures(tree.ScanCutCount, tree.TotalBranchLengthM);
    }
}
