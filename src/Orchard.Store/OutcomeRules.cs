namespace Orchard.Store;

/// <summary>
/// When an outcome may be recorded, the same in both stores. Refused: a tree without a schedule; a tree
/// scanned again since its current version was planned (that schedule is of a tree that no longer
/// stands so); a version that is not current; and an outcome for a cut that already has a final one
/// (done or skipped) or a missed one against the same version — the same word again is a duplicate,
/// another word a contradiction. A cut missed against one version may be reported again against the
/// re-planned version (it was retried).
/// </summary>
internal static class OutcomeRules
{
    /// <summary>Null when the outcome may be recorded; else the refusal.</summary>
    /// <param name="tree">The tree's current version, its scan and the newest scan; null when there is no such tree.</param>
    /// <param name="earlierForCut">Outcomes already recorded for this cut of the current scan, oldest first.</param>
    public static OutcomeResult? Judge(OutcomeSubmission outcome, (int? Version, string? ScanId, string LatestScanId)? tree, IReadOnlyList<OutcomeRecord> earlierForCut)
    {
        if (tree is not { Version: { } current } known)
        {
            return new OutcomeResult(OutcomeStatus.NoSchedule, null, null, null);
        }

        if (known.ScanId != known.LatestScanId)
        {
            return new OutcomeResult(OutcomeStatus.Rescanned, current, null, null) { LatestScanId = known.LatestScanId };
        }

        if (outcome.Version != current)
        {
            return new OutcomeResult(OutcomeStatus.StaleVersion, current, null, null);
        }

        foreach (var earlier in earlierForCut)
        {
            if (earlier.Outcome is CutOutcome.Done or CutOutcome.Skipped || earlier.Version == outcome.Version)
            {
                return new OutcomeResult(earlier.Outcome == outcome.Outcome ? OutcomeStatus.Duplicate : OutcomeStatus.Contradicts, current, null, null) { Earlier = earlier };
            }
        }

        return null;
    }
}
