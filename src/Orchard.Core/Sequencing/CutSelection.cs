using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>
/// Which cuts a plan or re-plan works on, and what it says of the others before any planning: cuts
/// reported done or left for a person, cuts above the shear's rating, and moot cuts (another cut of the
/// scan, made by the machine or by hand, removes their wood). Under <see cref="MootPolicy.CutFirst"/>
/// moot cuts stay, to be made before the cut that removes their wood.
/// </summary>
internal sealed record CutSelection(
    IReadOnlyList<int> Live,
    List<UnscheduledCut> Unscheduled,
    IReadOnlySet<int> Done,
    int? Missed,
    RetryPolicy Policy,
    IReadOnlyList<(int Before, int After)> Precedences)
{
    public static CutSelection Select(TreeScan scan, ArmProfile arm, BranchTopology topology, ReplanRequest request, MootPolicy policy)
    {
        var index = Enumerable.Range(0, scan.Cuts.Count).ToDictionary(i => scan.Cuts[i].Id, StringComparer.Ordinal);
        var done = request.DoneCutIds.Where(index.ContainsKey).Select(id => index[id]).ToHashSet();
        var dropped = request.DroppedCutIds.Where(index.ContainsKey).Select(id => index[id]).Where(c => !done.Contains(c)).ToHashSet();
        int? missed = request.MissedCutId is { } m && index.TryGetValue(m, out var mi) && !done.Contains(mi) ? mi : null;
        if (missed is { } dropMissed && request.Policy == RetryPolicy.Drop)
        {
            dropped.Add(dropMissed);
        }

        var standing = CutEligibility.Classify(scan, arm, topology);
        var unscheduled = new List<UnscheduledCut>();
        var live = new List<int>();
        var precedences = new List<(int, int)>();
        var rating = arm.Tool.MaxCutDiameterMm;
        for (var c = 0; c < scan.Cuts.Count; c++)
        {
            var cut = scan.Cuts[c];
            var s = standing[c];
            if (done.Contains(c))
            {
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Done, null, "Reported done."));
            }
            else if (dropped.Contains(c))
            {
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Dropped, null, c == missed ? "Missed; the retry policy leaves it for a person." : "Left for a person."));
            }
            else if (s.Kind == CutStandingKind.AboveShearRating)
            {
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Unreachable, UnscheduledReason.AboveShearRating, $"{cut.DiameterMm:F1} mm wood; the shear is rated for {rating:G} mm: a hand cut."));
            }
            else if (s.Kind == CutStandingKind.Moot && (policy == MootPolicy.Drop || done.Contains(s.RemovedBy!.Value)))
            {
                var by = s.RemovedBy!.Value;
                var how = done.Contains(by) ? "was already cut off" : "will be cut off";
                unscheduled.Add(new UnscheduledCut(cut.Id, UnscheduledStatus.Moot, UnscheduledReason.RemovedByCut, $"Its wood {how} by cut {scan.Cuts[by].Id}.", scan.Cuts[by].Id));
            }
            else
            {
                live.Add(c);
                if (s.Kind == CutStandingKind.Moot)
                {
                    precedences.Add((c, s.RemovedBy!.Value));
                }
            }
        }

        return new CutSelection(live, unscheduled, done, missed, request.Policy, precedences);
    }
}
