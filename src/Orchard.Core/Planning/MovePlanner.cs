using Orchard.Core.Collision;
using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// The planner moves are made with: any midpoint-displacement variant or RRT-Connect as the primary,
/// then (for the production set-up) RRT-Connect as a fallback within the same call, then
/// shortcutting. The result says which method solved it; its statistics cover every stage.
/// </summary>
public sealed class MovePlanner
{
    private readonly IMotionPlanner _primary;
    private readonly RrtConnectPlanner? _fallback;
    private readonly ShortcutSettings _shortcut;

    public MovePlanner(MovePlannerSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        _primary = new RecursiveMidpointPlanner(settings.Primary);
        _fallback = settings.UseFallback ? new RrtConnectPlanner(settings.Fallback) : null;
        _shortcut = settings.Shortcut;
    }

    /// <summary>A single method, shortcut afterwards, no fallback (for comparing methods side by side).</summary>
    public MovePlanner(IMotionPlanner only, ShortcutSettings shortcut)
    {
        _primary = only ?? throw new ArgumentNullException(nameof(only));
        _shortcut = shortcut ?? throw new ArgumentNullException(nameof(shortcut));
    }

    /// <summary>A move of the arm in its scene: <see cref="Plan(double[], double[], IMotionValidator, DeterministicRandom, TimeProvider, CancellationToken)"/> with the checker as validator.</summary>
    public MotionPlanResult Plan(double[] start, double[] goal, CollisionChecker checker, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken) =>
        Plan(start, goal, new ArmMotionValidator(checker), random, clock, cancellationToken);

    public MotionPlanResult Plan(double[] start, double[] goal, IMotionValidator validator, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(validator);
        ArgumentNullException.ThrowIfNull(clock);
        var began = clock.GetTimestamp();
        var startChecks = validator.Checks;
        var result = _primary.Plan(start, goal, validator, random, clock, cancellationToken);
        var iterations = result.Statistics.Iterations;
        var depth = result.Statistics.MaxDepth;
        if (!result.Success && _fallback is not null)
        {
            result = _fallback.Plan(start, goal, validator, random, clock, cancellationToken);
            iterations += result.Statistics.Iterations;
        }

        var beforeShortcut = validator.Checks;
        if (result.Success && result.Path.Count > 2)
        {
            result = result with { Path = PathShortcutter.Shorten(result.Path, validator, _shortcut, random, cancellationToken) };
        }

        return result with { Statistics = new PlanningStatistics(validator.Checks - startChecks, iterations, depth, clock.GetElapsedTime(began), validator.Checks - beforeShortcut) };
    }

    /// <summary>
    /// One path from two free paths that meet (the last waypoint of <paramref name="first"/> is the first of
    /// <paramref name="second"/>), shortcut like any planned path: <see cref="PlannerMethod.Via"/>. Every
    /// segment stays checked free, as the halves' segments are and the shortcutter keeps only free ones.
    /// </summary>
    public MotionPlanResult Join(IReadOnlyList<double[]> first, IReadOnlyList<double[]> second, IMotionValidator validator, DeterministicRandom random, TimeProvider clock, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(first);
        ArgumentNullException.ThrowIfNull(second);
        ArgumentNullException.ThrowIfNull(validator);
        ArgumentNullException.ThrowIfNull(clock);
        if (first.Count < 2 || second.Count < 2 || !first[^1].AsSpan().SequenceEqual(second[0]))
        {
            throw new ArgumentException("The two paths must each have two waypoints or more and meet: the first's last waypoint is the second's first.", nameof(second));
        }

        var began = clock.GetTimestamp();
        var startChecks = validator.Checks;
        var path = new List<double[]>(first.Count + second.Count - 1);
        path.AddRange(first);
        path.AddRange(second.Skip(1));
        var shortened = PathShortcutter.Shorten(path, validator, _shortcut, random, cancellationToken);
        var checks = validator.Checks - startChecks;
        return new MotionPlanResult(true, shortened, PlannerMethod.Via, new PlanningStatistics(checks, 0, 0, clock.GetElapsedTime(began), checks));
    }
}
