namespace Orchard.Core.Timing;

/// <summary>
/// A knot of a joint trajectory: time from the trajectory's start, joint positions and velocities
/// (joint units). Between two consecutive knots every joint's acceleration is constant, so the motion
/// between knots is exactly the quadratic through both positions with these end velocities.
/// </summary>
public sealed record TrajectoryPoint(double TimeS, IReadOnlyList<double> Positions, IReadOnlyList<double> Velocities);
