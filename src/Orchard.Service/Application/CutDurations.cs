using Orchard.Core.Model;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;
using ValidationProblem = Orchard.Core.Validation.ValidationProblem;

namespace Orchard.Service.Application;

/// <summary>
/// The cut durations a controller may report with a <c>done</c> outcome (<c>durationSeconds</c>): checked
/// with the outcome, stored once the outcome is accepted, with the cut's diameter from the tree's scan, for
/// the block's measured cut-time model.
/// </summary>
public static class CutDurations
{
    /// <summary>Longest plausible cut, seconds: a shear closing for ten minutes is a stalled machine, not a cut.</summary>
    public const double MaxSeconds = 600;

    /// <summary>Adds the problems of a reported duration: a finite number above 0 and at most <see cref="MaxSeconds"/>, on a done cut only.</summary>
    public static void Check(OutcomeReport report, List<ValidationProblem> errors)
    {
        ArgumentNullException.ThrowIfNull(report);
        ArgumentNullException.ThrowIfNull(errors);
        if (report.DurationSeconds is not { } seconds)
        {
            return;
        }

        if (report.Outcome is not CutOutcome.Done)
        {
            errors.Add(ValidationProblem.Error("$.durationSeconds", "duration.notDone", "Only a done cut has a cut duration; leave durationSeconds out for missed and skipped cuts."));
        }
        else if (!double.IsFinite(seconds) || seconds <= 0 || seconds > MaxSeconds)
        {
            errors.Add(ValidationProblem.Error("$.durationSeconds", "duration.outOfRange", $"The cut's duration must be above 0 and at most {MaxSeconds:G} seconds; it is {seconds:G}."));
        }
    }

    /// <summary>
    /// After the outcome is accepted: stores its duration (if any) with the cut's diameter. A store fault
    /// here loses one measurement, not the outcome, so it is not passed on.
    /// </summary>
    public static async Task RecordAsync(IOrchardStore store, Store.TreeRecord tree, OutcomeReport report, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(tree);
        ArgumentNullException.ThrowIfNull(report);
        if (report.DurationSeconds is not { } seconds || report.Outcome != CutOutcome.Done || report.Version is not { } version)
        {
            return;
        }

        try
        {
            var scan = await store.GetScanAsync(tree.LatestScanId, cancellationToken) is { } json ? OrchardJson.Parse<TreeScan>(json).Value : null;
            if (scan?.Cuts.FirstOrDefault(c => c.Id == report.CutId) is { } cut)
            {
                await store.AddCutDurationAsync(new CutDurationRecord(tree.TreeId, tree.Block, version, cut.Id, cut.DiameterMm, seconds, DateTimeOffset.UnixEpoch), cancellationToken);
            }
        }
        catch (Exception ex) when (StoreFaults.IsTransient(ex))
        {
            // The outcome stands; this one measurement is lost.
        }
    }
}
