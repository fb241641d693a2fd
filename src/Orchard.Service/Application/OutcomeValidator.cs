using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// Checks a controller's cut outcome against the tree's newest schedule: every required member, the arm's
/// joint values (finite, one per joint) when a missed cut must be re-planned from them, and a cut that is a
/// step of the version it names. Every problem at once, each with its JSON path. Whether the version is
/// current, the tree was scanned again, or the cut already has an outcome is the store's to say (409).
/// </summary>
public static class OutcomeValidator
{
    public static List<ValidationProblem> Validate(OutcomeReport report, ScheduleRecord? current)
    {
        ArgumentNullException.ThrowIfNull(report);
        var errors = new List<ValidationProblem>();
        if (report.Version is null)
        {
            errors.Add(ValidationProblem.Error("$.version", "field.missing", "This field is required: the schedule version the cut belongs to."));
        }

        if (report.Outcome is null)
        {
            errors.Add(ValidationProblem.Error("$.outcome", "field.missing", "This field is required: done, missed or skipped."));
        }

        if (string.IsNullOrWhiteSpace(report.CutId))
        {
            errors.Add(ValidationProblem.Error("$.cutId", "field.missing", "This field is required."));
        }

        if (report.Outcome == CutOutcome.Missed && (report.Configuration is null || report.Configuration.Count == 0 || report.Configuration.Any(v => !double.IsFinite(v))))
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

        var joints = schedule.Stops.Count > 0 ? schedule.Stops[0].StartConfiguration.Count : 0;
        if (report.Configuration is { } q && joints > 0 && q.Count != joints)
        {
            errors.Add(ValidationProblem.Error("$.configuration", "configuration.length", $"Needs {joints} joint values; got {q.Count}."));
        }

        return errors;
    }
}
