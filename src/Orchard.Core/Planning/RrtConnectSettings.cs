namespace Orchard.Core.Planning;

/// <summary>Settings of <see cref="RrtConnectPlanner"/>. Defaults in brackets.</summary>
public sealed record RrtConnectSettings
{
    /// <summary>Longest tree edge, Euclidean joint space [0.35].</summary>
    public double StepSize { get; init; } = 0.35;

    /// <summary>Random samples drawn before giving up [3,000].</summary>
    public int MaxSamples { get; init; } = 3_000;

    /// <summary>Collision checks one plan may spend [60,000].</summary>
    public long MaxCollisionChecks { get; init; } = 60_000;

    public static RrtConnectSettings Default { get; } = new();
}
