using Orchard.Core.Planning;
using Orchard.Core.Randomness;

namespace Orchard.Service.Bench;

/// <summary>
/// The production set-up as one planner for <c>bench moves</c>: the primary, then, when it fails, the fallback in the
/// same call (as <see cref="MovePlanner"/> runs them); the statistics cover both.
/// </summary>
internal sealed class FallbackPlanner(IMotionPlanner primary, IMotionPlanner fallback) : IMotionPlanner
{
    public PlannerMethod Method => primary.Method;

    public MotionPlanResult Plan(double[] start, double[] goal, IMotionValidator validator, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken)
    {
        var first = primary.Plan(start, goal, validator, random, clock, cancellationToken);
        if (first.Success)
        {
            return first;
        }

        var second = fallback.Plan(start, goal, validator, random, clock, cancellationToken);
        var (a, b) = (first.Statistics, second.Statistics);
        return second with { Statistics = new PlanningStatistics(a.CollisionChecks + b.CollisionChecks, a.Iterations + b.Iterations, a.MaxDepth, a.Elapsed + b.Elapsed) };
    }
}
