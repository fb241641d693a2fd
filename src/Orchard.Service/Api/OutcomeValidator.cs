using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>
/// Checks a controller's cut outcome against the tree's current schedule: a known outcome word, a cut id,
/// the arm's joint values (finite, one per joint) when a missed cut must be re-planned from them, and a cut
/// that is a step of the version it names. Every problem at once, each with its JSON path. A stale version
/// is not a problem here: the store answers it with 409 and the current version.
/// </summary>
public static class OutcomeValidator
{
    public static List<ValidationProblem> Validate(OutcomeReport report, ScheduleRecord? current)
    {
        ArgumentNullException.ThrowIfNull(report);
        var errors = new List<ValidationProblem>();
        if (report.Outcome is not ("done" or "missed" or "skipped"))
        {
            errors.Add(ValidationProblem.Error("$.outcome", "outcome.unknown", "Must be done, missed or skipped."));
        }

        if (string.IsNullOrWhiteSpace(report.CutId))
        {
            errors.Add(ValidationProblem.Error("$.cutId", "field.missing", "This field is required."));
        }

        if (report.Outcome == "missed" && (report.Configuration is null || report.Configuration.Count == 0 || report.Configuration.Any(v => !double.IsFinite(v))))
        {
            errors.Add(ValidationProblem.Error("$.configuration", "configuration.required", "A missed cut needs the arm's current joint values (finite numbers) to re-plan from."));
        }

        CutDurations.Check(report, errors);
        if (current is null || errors.Count > 0)
        {
            return errors;
        }

        var schedule = OrchardJson.Parse<Core.Model.Schedule>(current.ScheduleJson).Value!;
        if (report.Version == current.Version && !schedule.AllSteps().Any(s => s.CutId == report.CutId))
        {
            errors.Add(ValidationProblem.Error("$.cutId", "cut.notInSchedule", $"Cut '{report.CutId}' is not a step of schedule version {current.Version}."));
        }

        if (report.Configuration is { } q && q.Count != schedule.Stops[0].StartConfiguration.Count)
        {
            errors.Add(ValidationProblem.Error("$.configuration", "configuration.length", $"Needs {schedule.Stops[0].StartConfiguration.Count} joint values; got {q.Count}."));
        }

        return errors;
    }
}
