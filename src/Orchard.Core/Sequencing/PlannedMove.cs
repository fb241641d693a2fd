using Orchard.Core.Planning;

namespace Orchard.Core.Sequencing;

/// <summary>A planned move between two configurations: its joint path and timed duration, or a failure.</summary>
public sealed record PlannedMove(bool Success, IReadOnlyList<double[]> Path, double DurationS, PlannerMethod Method);
