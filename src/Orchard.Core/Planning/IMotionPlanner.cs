using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// Plans a collision-free joint path between two free configurations. Everything arrives as an
/// argument: the motion validator (which knows the space and what is free), a seeded random source, the clock used
/// only to report elapsed time, and the cancellation token that carries any time budget.
/// </summary>
public interface IMotionPlanner
{
    PlannerMethod Method { get; }

    MotionPlanResult Plan(double[] start, double[] goal, IMotionValidator validator, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken);
}
