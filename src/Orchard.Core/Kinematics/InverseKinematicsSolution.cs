namespace Orchard.Core.Kinematics;

/// <summary>One inverse-kinematics solution: joint values whose TCP pose meets the target within the tolerances.</summary>
/// <param name="Joints">One value per joint, joint units, within the joint limits.</param>
/// <param name="PositionErrorM">Distance from the solution's TCP to the target position, metres.</param>
/// <param name="OrientationErrorRad">Angle between the solution's TCP orientation and the target's, radians.</param>
/// <param name="DistanceToFirstSeed">Euclidean joint-space distance to the first seed tried, joint units.</param>
/// <param name="SeedIndex">Which seed it came from: the caller's seeds first (0, 1, …), then the random ones.</param>
/// <param name="Iterations">Damped least-squares steps it took from its seed.</param>
public sealed record InverseKinematicsSolution(
    IReadOnlyList<double> Joints,
    double PositionErrorM,
    double OrientationErrorRad,
    double DistanceToFirstSeed,
    int SeedIndex,
    int Iterations);
