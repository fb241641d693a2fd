using Orchard.Core.Model;

namespace Orchard.Core.Sequencing;

/// <summary>One stop as built: the schedule's stop, and the cuts of its tour that could not be made (no move found).</summary>
internal sealed record StopBuild(ScheduleStop Stop, IReadOnlyList<int> Failed, bool ReturnedToStow);
