using Orchard.Core.Model;
using Orchard.Core.Sequencing;

namespace Orchard.Service.Application;

/// <summary>
/// What a re-plan job needs beyond the store, kept with it: where the arm is (its joint values, and the
/// base pose of the stop where the platform stands), the missed cut, and what to do with it. The cuts already done or left for a person are read when the job runs, from the outcomes of
/// the job's scan and the schedule it re-plans, so reports that arrive while it waits count too.
/// </summary>
public sealed record ReplanPayload(IReadOnlyList<double> CurrentConfiguration, string MissedCutId, RetryPolicy Policy, ArmBasePose? ArmBase = null);
