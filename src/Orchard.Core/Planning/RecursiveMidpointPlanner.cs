using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// Recursive midpoint displacement (RMPD) and its cost-aware form (cRMPD): F. Li, A. V. Manerikar and
/// A. C. Kak, "RMPD — A Recursive Mid-Point Displacement Algorithm for Path Planning", Proceedings of
/// the International Conference on Automated Planning and Scheduling (ICAPS) 28(1), 468–475, 2018,
/// doi:10.1609/icaps.v28i1.13921.
/// <para>
/// The idea: never leave the straight line unless an obstacle forces it. If the joint-space segment
/// qa → qb is free, it is the path. Otherwise its midpoint is displaced to a nearby free configuration
/// found by Gaussian sampling around it, with a spread proportional to the segment's length that grows
/// after rounds without a free sample; then both halves are solved the same way. When the halves
/// cannot be solved from that midpoint, a new one is sought with a wider spread (a bounded number of
/// retries: the spread adapts to failures of the recursion too, not only of the sampling). Depth and
/// checks are bounded. Ours, not the paper's: each waypoint the recursion reaches short of the goal is tried
/// straight to the goal, and the search ends there when that is free (<see cref="RmpdSettings.JoinGoalEarly"/>).
/// </para>
/// <para>
/// Variants. <b>Plain</b> takes the first free sample. <b>Cost-aware</b> scores each free sample with
/// f(q) = clearance term + smoothness term (the smoothness term being the triangle-inequality excess
/// T(qa, q) + T(q, qb) − T(qa, qb), relative to T(qa, qb); T is the space's rest-to-rest travel time by default,
/// which is ours, or its distance, which is the paper's: <see cref="RmpdSettings.DetourMeasure"/>), re-centres on the mean of the samples
/// weighted by 1/f, repeats, and keeps the best free point seen. <b>Greedy</b> re-centres on the best
/// sample instead of the mean.
/// </para>
/// </summary>
public sealed class RecursiveMidpointPlanner(RmpdSettings settings) : IMotionPlanner
{
    public RmpdSettings Settings { get; } = settings ?? throw new ArgumentNullException(nameof(settings));

    public PlannerMethod Method => Settings.Variant;

    public MotionPlanResult Plan(double[] start, double[] goal, IMotionValidator validator, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(start);
        ArgumentNullException.ThrowIfNull(goal);
        ArgumentNullException.ThrowIfNull(validator);
        ArgumentNullException.ThrowIfNull(random);
        ArgumentNullException.ThrowIfNull(clock);
        var began = clock.GetTimestamp();
        var run = new Run(this, validator, random, validator.Checks, goal, cancellationToken);
        var path = new List<double[]> { start };
        var ok = run.Solve(start, goal, 0, path);
        var stats = new PlanningStatistics(validator.Checks - run.StartChecks, run.Midpoints, run.DeepestLevel, clock.GetElapsedTime(began));
        if (!ok)
        {
            return MotionPlanResult.Failed(Method, stats, run.Failure ?? "no free midpoint found");
        }

        return new MotionPlanResult(true, path, run.Midpoints == 0 ? PlannerMethod.Direct : Method, stats);
    }

    /// <summary>One planning call's state.</summary>
    private sealed class Run(RecursiveMidpointPlanner planner, IMotionValidator validator, DeterministicRandom random, long startChecks, double[] goal, CancellationToken cancellationToken)
    {
        /// <summary>Set once a waypoint has been joined straight to the goal: the path is complete.</summary>
        private bool _reachedGoal;

        private readonly RmpdSettings _s = planner.Settings;

        private IConfigurationSpace Space => validator.Space;

        public long StartChecks { get; } = startChecks;

        public int Midpoints { get; private set; }

        public int DeepestLevel { get; private set; }

        public string? Failure { get; private set; }

        /// <summary>Appends the path from qa (already in <paramref name="path"/>) to qb, qb included.</summary>
        public bool Solve(double[] qa, double[] qb, int depth, List<double[]> path)
        {
            cancellationToken.ThrowIfCancellationRequested();
            DeepestLevel = Math.Max(DeepestLevel, depth);
            if (_reachedGoal)
            {
                return true;
            }

            if (validator.IsMotionFree(qa, qb))
            {
                path.Add(qb);

                // Ours: a new waypoint short of the goal that sees the goal ends the search there.
                if (_s.JoinGoalEarly && !ReferenceEquals(qb, goal) && validator.IsMotionFree(qb, goal))
                {
                    path.Add(goal);
                    _reachedGoal = true;
                }

                return true;
            }

            if (depth >= _s.MaxDepth)
            {
                Failure = $"still blocked at depth {depth}";
                return false;
            }

            if (validator.Checks - StartChecks > _s.MaxCollisionChecks)
            {
                Failure = $"check budget of {_s.MaxCollisionChecks} spent";
                return false;
            }

            // A displaced midpoint whose halves cannot be solved is replaced by one from a wider search
            // (the spread keeps adapting to failure), up to MidpointRetries times.
            var spreadScale = 1.0;
            for (var attempt = 0; attempt <= _s.MidpointRetries; attempt++)
            {
                Midpoints++;
                var midpoint = Displace(qa, qb, spreadScale, firstFree: attempt > 0 && _s.RetriesTakeFirstFree);
                spreadScale *= _s.RetrySpreadGrowth;
                if (midpoint is null)
                {
                    Failure ??= $"no free configuration near the midpoint at depth {depth}";
                    continue;
                }

                var mark = path.Count;
                if (Solve(qa, midpoint, depth + 1, path) && Solve(midpoint, qb, depth + 1, path))
                {
                    return true;
                }

                path.RemoveRange(mark, path.Count - mark);
                if (validator.Checks - StartChecks > _s.MaxCollisionChecks)
                {
                    return false;
                }
            }

            return false;
        }

        /// <summary>A free configuration near the midpoint of qa → qb, or null.</summary>
        private double[]? Displace(double[] qa, double[] qb, double spreadScale, bool firstFree)
        {
            var n = qa.Length;
            var length = Space.Distance(qa, qb);
            var spread = spreadScale * Math.Max(_s.MinSpread, _s.InitialSpreadFraction * length);
            var centre = Space.Interpolate(qa, qb, 0.5);
            double[]? best = null;
            var bestCost = double.PositiveInfinity;
            var costRounds = 0;
            var sample = new double[n];
            var weighted = new double[n];

            for (var round = 0; round < _s.MaxRounds; round++)
            {
                if (validator.Checks - StartChecks > _s.MaxCollisionChecks)
                {
                    break;
                }

                var totalWeight = 0.0;
                Array.Clear(weighted);
                var freeThisRound = 0;
                for (var k = 0; k < _s.SamplesPerRound; k++)
                {
                    for (var j = 0; j < n; j++)
                    {
                        sample[j] = Math.Clamp(centre[j] + (spread * random.NextGaussian()), Space.LowerLimits[j], Space.UpperLimits[j]);
                    }

                    if (!validator.IsFree(sample))
                    {
                        continue;
                    }

                    freeThisRound++;
                    if (_s.Variant == PlannerMethod.Plain || firstFree)
                    {
                        return sample.ToArray();
                    }

                    var cost = Cost(qa, sample, qb, length);
                    if (cost < bestCost)
                    {
                        bestCost = cost;
                        best = sample.ToArray();
                    }

                    var w = 1.0 / cost;
                    totalWeight += w;
                    for (var j = 0; j < n; j++)
                    {
                        weighted[j] += w * sample[j];
                    }
                }

                if (freeThisRound == 0)
                {
                    // Nothing free this close: look wider.
                    spread *= _s.SpreadGrowth;
                    continue;
                }

                // Re-centre: the inverse-cost weighted mean (cost-aware) or the best sample (greedy).
                if (_s.Variant == PlannerMethod.Greedy)
                {
                    centre = best!.ToArray();
                }
                else
                {
                    for (var j = 0; j < n; j++)
                    {
                        centre[j] = weighted[j] / totalWeight;
                    }

                    // The mean of free samples need not be free; keep it if it is and it scores better.
                    if (validator.IsFree(centre))
                    {
                        var cost = Cost(qa, centre, qb, length);
                        if (cost < bestCost)
                        {
                            bestCost = cost;
                            best = centre.ToArray();
                        }
                    }
                }

                if (++costRounds >= _s.CostIterations)
                {
                    break;
                }
            }

            return best;
        }

        private double Cost(double[] qa, double[] q, double[] qb, double length)
        {
            var clearance = validator.ClearanceM(q);
            var clearanceTerm = _s.ClearanceWeight * Math.Max(0, 1 - (clearance / _s.ClearanceScaleM));
            double smoothTerm;
            if (_s.DetourMeasure == DetourMeasure.TravelTime)
            {
                // Ours, not the paper's: the detour in the time the slowest joint takes, which is what execution pays.
                var direct = Space.TravelTimeS(qa, qb);
                smoothTerm = _s.SmoothnessWeight * (Space.TravelTimeS(qa, q) + Space.TravelTimeS(q, qb) - direct) / Math.Max(direct, 1e-9);
            }
            else
            {
                smoothTerm = _s.SmoothnessWeight * (Space.Distance(qa, q) + Space.Distance(q, qb) - Space.Distance(qa, qb)) / Math.Max(length, 1e-9);
            }

            return _s.CostFloor + clearanceTerm + smoothTerm;
        }
    }
}

