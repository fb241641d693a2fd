using Orchard.Core.Collision;
using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>Plans a move of the arm in its scene: any planner with the checker as its motion validator.</summary>
public static class MotionPlannerExtensions
{
    public static MotionPlanResult Plan(this IMotionPlanner planner, double[] start, double[] goal, CollisionChecker checker, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(planner);
        return planner.Plan(start, goal, new ArmMotionValidator(checker), random, clock, cancellationToken);
    }
}
