namespace Orchard.Core.Kinematics;

/// <summary>The distinct solutions of one inverse-kinematics solve, nearest the first seed first.</summary>
public sealed record InverseKinematicsResult(
    IReadOnlyList<InverseKinematicsSolution> Solutions,
    InverseKinematicsStatistics Statistics)
{
    /// <summary>True when at least one solution was found.</summary>
    public bool Found => Solutions.Count > 0;
}
