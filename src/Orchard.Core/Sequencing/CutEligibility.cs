using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Which of a scan's cuts the machine should make at all: those within the shear's rating whose wood no
/// other cut of the scan removes. A cut beyond another marked cut is moot whoever makes the other one
/// (the machine now, or the hand crew later): its wood goes either way. This is the denominator of
/// coverage: the share of eligible cuts a schedule takes off the hand crew.
/// </summary>
public static class CutEligibility
{
    /// <summary>Per cut of the scan: eligible, above the shear's rating, or moot (with the cut that removes its wood).</summary>
    public static IReadOnlyList<CutStanding> Classify(TreeScan scan, ArmProfile arm, BranchTopology topology)
    {
        ArgumentNullException.ThrowIfNull(scan);
        ArgumentNullException.ThrowIfNull(arm);
        ArgumentNullException.ThrowIfNull(topology);
        var all = Enumerable.Range(0, scan.Cuts.Count).ToArray();
        var moot = MootRule.Find(scan, topology, all);
        var rating = arm.Tool.MaxCutDiameterMm;
        return all.Select(c =>
            scan.Cuts[c].DiameterMm > rating ? new CutStanding(c, CutStandingKind.AboveShearRating, null)
            : moot.TryGetValue(c, out var by) ? new CutStanding(c, CutStandingKind.Moot, by)
            : new CutStanding(c, CutStandingKind.Eligible, null)).ToArray();
    }
}
