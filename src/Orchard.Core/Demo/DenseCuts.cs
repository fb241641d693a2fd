using Orchard.Core.Model;
using Orchard.Core.Sequencing;

namespace Orchard.Core.Demo;

/// <summary>
/// Denser demo trees for benchmarks and tests: a scan with heading cuts added half-way along branches that
/// carry no cut yet (nor one above or below them on the same limb line, so no added cut is moot or makes
/// another moot), wood within the shear's working range (4–18 mm), in a fixed order drawn from the seed,
/// until the tree has the number of cuts asked for; when no such branch is left, cuts on other branches in range
/// without one (these may be moot).
/// </summary>
public static class DenseCuts
{
    public static TreeScan WithCuts(TreeScan scan, int cuts, ulong seed)
    {
        ArgumentNullException.ThrowIfNull(scan);
        var topology = new BranchTopology(scan);
        var taken = scan.Cuts.Select(c => topology.BranchIndex[c.BranchId]).ToList();
        var added = new List<Cut>();
        var order = Enumerable.Range(0, scan.Branches.Count)
            .OrderBy(b => StableHash.Of(seed, scan.TreeId, scan.Branches[b].Id))
            .ToArray();
        foreach (var b in order)
        {
            if (scan.Cuts.Count + added.Count >= cuts)
            {
                break;
            }

            var branch = scan.Branches[b];
            var diameterMm = Math.Round(1000 * (branch.FromRadiusM + branch.ToRadiusM), 1);
            if (diameterMm is < 4 or > 18 || taken.Any(t => t == b || topology.IsStrictAncestor(t, b) || topology.IsStrictAncestor(b, t)))
            {
                continue;
            }

            added.Add(new Cut($"d{added.Count + 1:D2}", branch.Id, 0.5, CutKind.Heading, diameterMm));
            taken.Add(b);
        }

        // Not enough such branches: more cuts anywhere in range, on branches without one (some of these are moot).
        foreach (var b in order)
        {
            if (scan.Cuts.Count + added.Count >= cuts)
            {
                break;
            }

            var branch = scan.Branches[b];
            var diameterMm = Math.Round(1000 * (branch.FromRadiusM + branch.ToRadiusM), 1);
            if (diameterMm is < 4 or > 18 || taken.Contains(b))
            {
                continue;
            }

            added.Add(new Cut($"d{added.Count + 1:D2}", branch.Id, 0.5, CutKind.Heading, diameterMm));
            taken.Add(b);
        }

        return scan with { Cuts = [.. scan.Cuts, .. added] };
    }
}
