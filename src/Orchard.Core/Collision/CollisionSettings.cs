namespace Orchard.Core.Collision;

/// <summary>Margins and budgets of the collision checks. Defaults in brackets.</summary>
public sealed record CollisionSettings
{
    /// <summary>Least distance between the arm and wood, wires or posts [10 mm].</summary>
    public double SafetyMarginM { get; init; } = 0.010;

    /// <summary>Least distance between two parts of the arm, and between the arm and its base [5 mm].</summary>
    public double SelfMarginM { get; init; } = 0.005;

    /// <summary>Least height of any part of the arm above the ground [50 mm].</summary>
    public double GroundMarginM { get; init; } = 0.050;

    /// <summary>Distance queries look no farther than this [0.5 m]: beyond it, a step is limited by this value.</summary>
    public double DistanceCapM { get; init; } = 0.5;

    /// <summary>
    /// Conservative advancement gives up proving an edge free when the room left above a margin falls
    /// below this [0.5 mm]; the edge then counts as colliding (grazing is not free).
    /// </summary>
    public double GrazeToleranceM { get; init; } = 0.0005;

    /// <summary>
    /// Before advancing along an edge, probe this many bisection levels of interior points with the
    /// cheap yes/no check (2^levels − 1 points) to reject blocked edges early [3].
    /// </summary>
    public int EdgeProbeLevels { get; init; } = 3;

    /// <summary>
    /// Advancement first asks the cheap overlap query whether anything is within the safety margin plus
    /// this distance; if nothing is, that distance serves as the (lower-bound) clearance [60 mm].
    /// </summary>
    public double AdvancementProbeM { get; init; } = 0.06;

    /// <summary>Most advancement steps on one edge before it counts as colliding [4,000].</summary>
    public int MaxEdgeSteps { get; init; } = 4000;

    public static CollisionSettings Default { get; } = new();
}
