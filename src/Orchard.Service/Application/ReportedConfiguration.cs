using System.Globalization;
using Orchard.Core.Collision;
using Orchard.Core.Model;
using Orchard.Core.Sequencing;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// Checks where the arm says it is when it reports a missed cut, before a re-plan is queued: joint values
/// outside a joint's limits, or a configuration in contact that no straight retreat along the shear's axis
/// leaves, get a 422 naming the joint or what the arm touches (the arm needs a person first; a re-plan could
/// not move it). The check is the core's own (<see cref="StartRetreat"/>), at the stop of the missed cut.
/// </summary>
public static class ReportedConfiguration
{
    public static async Task<List<ValidationProblem>> CheckAsync(IOrchardStore store, TreeRecord tree, ScheduleRecord current, string cutId, IReadOnlyList<double> configuration, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(store);
        ArgumentNullException.ThrowIfNull(tree);
        ArgumentNullException.ThrowIfNull(current);
        var problems = new List<ValidationProblem>();
        var schedule = OrchardJson.Parse<Schedule>(current.ScheduleJson).Value;
        var scanJson = await store.GetScanAsync(current.ScanId, cancellationToken);
        var armJson = await store.GetArmProfileAsync(tree.ArmProfileId, cancellationToken);
        var scan = scanJson is null ? null : OrchardJson.Parse<TreeScan>(scanJson).Value;
        var arm = armJson is null ? null : OrchardJson.Parse<ArmProfile>(armJson).Value;
        var stop = schedule?.Stops.FirstOrDefault(s => s.Steps.Any(x => x.CutId == cutId));
        if (scan is null || arm is null || stop is null)
        {
            return problems; // Nothing to check against; the re-plan itself reports what it finds.
        }

        var cell = new WorkCell(scan, arm).AtStand(stop.ArmBase);
        var start = StartRetreat.Assess(cell, configuration, SequencingSettings.Default.Reachability);
        switch (start.Condition)
        {
            case StartCondition.OutsideLimits:
                var joint = arm.Joints.Select((j, i) => (j.Name, i)).FirstOrDefault(p => p.Name == start.Joint);
                problems.Add(ValidationProblem.Error(
                    start.Joint is null ? "$.configuration" : string.Create(CultureInfo.InvariantCulture, $"$.configuration[{joint.i}]"),
                    "configuration.outsideLimits", start.Message));
                break;
            case StartCondition.Trapped:
                problems.Add(ValidationProblem.Error("$.configuration", "configuration.trapped", start.Message));
                break;
        }

        return problems;
    }
}
