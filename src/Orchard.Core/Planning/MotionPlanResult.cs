namespace Orchard.Core.Planning;

/// <summary>
/// A planned joint path from start (first waypoint) to goal (last), every straight segment between
/// waypoints checked free, or a failure; with the method that solved it and what it cost.
/// </summary>
public sealed record MotionPlanResult(bool Success, IReadOnlyList<double[]> Path, PlannerMethod Method, PlanningStatistics Statistics, string? Failure = null)
{
    /// <summary>Sum of the segments' Euclidean joint-space lengths (joint units, mostly radians).</summary>
    public double PathLength => JointSpace.PathLength(Path);

    public static MotionPlanResult Failed(PlannerMethod method, PlanningStatistics statistics, string why) => new(false, [], method, statistics, why);
}
