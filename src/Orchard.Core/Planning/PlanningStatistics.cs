namespace Orchard.Core.Planning;

/// <summary>What a planning call cost.</summary>
/// <param name="CollisionChecks">Configuration checks plus clearance evaluations (edge-advancement steps included).</param>
/// <param name="Iterations">Midpoints displaced (midpoint planners) or tree extensions (RRT-Connect).</param>
/// <param name="MaxDepth">Deepest recursion reached (midpoint planners; 0 otherwise).</param>
/// <param name="Elapsed">Wall time, as measured with the clock the caller passed in.</param>
/// <param name="ShortcutChecks">Of <paramref name="CollisionChecks"/>, those the shortcutting after the planner spent.</param>
public readonly record struct PlanningStatistics(long CollisionChecks, int Iterations, int MaxDepth, TimeSpan Elapsed, long ShortcutChecks = 0);
