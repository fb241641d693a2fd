namespace Orchard.Core.Kinematics;

/// <summary>The outcome of damped least squares from one seed (see <see cref="InverseKinematics.SolveFromSeed"/>).</summary>
/// <param name="Converged">True when the final configuration meets both tolerances.</param>
/// <param name="PositionErrorM">Final distance from the TCP to the target position, metres.</param>
/// <param name="OrientationErrorRad">Final angle between the TCP orientation and the target's, radians.</param>
/// <param name="Iterations">Steps taken, kept or discarded.</param>
public readonly record struct InverseKinematicsAttempt(bool Converged, double PositionErrorM, double OrientationErrorRad, int Iterations);
