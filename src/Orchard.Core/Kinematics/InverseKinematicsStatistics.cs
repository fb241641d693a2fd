namespace Orchard.Core.Kinematics;

/// <summary>What one multi-seed inverse-kinematics solve did.</summary>
/// <param name="Iterations">Damped least-squares steps over all seeds, kept or discarded.</param>
/// <param name="SeedsTried">Seeds started (the caller's and random ones).</param>
/// <param name="SeedsConverged">Seeds that reached the tolerances, duplicates included.</param>
/// <param name="Cancelled">True when the cancellation token stopped the solve before every seed was tried.</param>
public readonly record struct InverseKinematicsStatistics(int Iterations, int SeedsTried, int SeedsConverged, bool Cancelled);
