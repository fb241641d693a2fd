using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// RRT-Connect: J. J. Kuffner and S. M. LaValle, "RRT-Connect: An Efficient Approach to Single-Query
/// Path Planning", Proc. IEEE International Conference on Robotics and Automation (ICRA), 2000,
/// pp. 995–1001. Two trees grow from start and goal; each round one tree extends one step towards a
/// uniform random configuration, and the other tree then greedily connects towards the new node; the
/// trees swap roles. Edges are checked with the same checker as every other planner, nearest
/// neighbours by a linear scan (trees stay small for single moves).
/// </summary>
public sealed class RrtConnectPlanner(RrtConnectSettings settings) : IMotionPlanner
{
    public RrtConnectSettings Settings { get; } = settings ?? throw new ArgumentNullException(nameof(settings));

    public PlannerMethod Method => PlannerMethod.RrtConnect;

    public MotionPlanResult Plan(double[] start, double[] goal, IMotionValidator validator, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(start);
        ArgumentNullException.ThrowIfNull(goal);
        ArgumentNullException.ThrowIfNull(validator);
        ArgumentNullException.ThrowIfNull(random);
        ArgumentNullException.ThrowIfNull(clock);
        var began = clock.GetTimestamp();
        var startChecks = validator.Checks;
        PlanningStatistics Stats(int iterations) => new(validator.Checks - startChecks, iterations, 0, clock.GetElapsedTime(began));

        if (validator.IsMotionFree(start, goal))
        {
            return new MotionPlanResult(true, [start, goal], PlannerMethod.Direct, Stats(0));
        }

        var space = validator.Space;
        var a = new Tree(start, space);
        var b = new Tree(goal, space);
        var fromStart = true;
        for (var iteration = 1; iteration <= Settings.MaxSamples; iteration++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            if (validator.Checks - startChecks > Settings.MaxCollisionChecks)
            {
                return MotionPlanResult.Failed(Method, Stats(iteration), $"check budget of {Settings.MaxCollisionChecks} spent");
            }

            var target = space.SampleUniform(random);

            var added = Extend(a, target, validator);
            if (added >= 0)
            {
                var reached = Connect(b, a.Nodes[added], validator);
                if (reached >= 0)
                {
                    var path = fromStart ? Join(a, added, b, reached) : Join(b, reached, a, added);
                    return new MotionPlanResult(true, path, Method, Stats(iteration));
                }
            }

            (a, b) = (b, a);
            fromStart = !fromStart;
        }

        return MotionPlanResult.Failed(Method, Stats(Settings.MaxSamples), $"no connection after {Settings.MaxSamples} samples");
    }

    /// <summary>One step from the nearest node towards the target; the new node's index, or −1 when blocked.</summary>
    private int Extend(Tree tree, double[] target, IMotionValidator validator)
    {
        var nearest = tree.Nearest(target);
        var from = tree.Nodes[nearest];
        var distance = validator.Space.Distance(from, target);
        var next = distance <= Settings.StepSize ? target : validator.Space.Interpolate(from, target, Settings.StepSize / distance);
        return validator.IsMotionFree(from, next) ? tree.Add(next, nearest) : -1;
    }

    /// <summary>Steps towards the target until reached (its index) or blocked (−1).</summary>
    private int Connect(Tree tree, double[] target, IMotionValidator validator)
    {
        while (true)
        {
            var nearest = tree.Nearest(target);
            var from = tree.Nodes[nearest];
            var distance = validator.Space.Distance(from, target);
            if (distance < 1e-12)
            {
                return nearest;
            }

            var reaches = distance <= Settings.StepSize;
            var next = reaches ? target : validator.Space.Interpolate(from, target, Settings.StepSize / distance);
            if (!validator.IsMotionFree(from, next))
            {
                return -1;
            }

            var index = tree.Add(next, nearest);
            if (reaches)
            {
                return index;
            }
        }
    }

    /// <summary>Start tree's root → meeting node, then the goal tree's meeting node → its root.</summary>
    private static List<double[]> Join(Tree startTree, int startNode, Tree goalTree, int goalNode)
    {
        var path = new List<double[]>();
        for (var i = startNode; i >= 0; i = startTree.Parents[i])
        {
            path.Add(startTree.Nodes[i]);
        }

        path.Reverse();

        // The two meeting nodes are the same configuration: keep one.
        for (var i = goalTree.Parents[goalNode]; i >= 0; i = goalTree.Parents[i])
        {
            path.Add(goalTree.Nodes[i]);
        }

        return path;
    }

    private sealed class Tree(double[] root, IConfigurationSpace space)
    {
        public List<double[]> Nodes { get; } = [root];

        public List<int> Parents { get; } = [-1];

        public int Add(double[] q, int parent)
        {
            Nodes.Add(q);
            Parents.Add(parent);
            return Nodes.Count - 1;
        }

        public int Nearest(double[] q)
        {
            var best = 0;
            var bestDistance = double.PositiveInfinity;
            for (var i = 0; i < Nodes.Count; i++)
            {
                var d = space.Distance(Nodes[i], q);
                if (d < bestDistance)
                {
                    bestDistance = d;
                    best = i;
                }
            }

            return best;
        }
    }
}
