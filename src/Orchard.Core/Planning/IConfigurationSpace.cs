using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// The space a planner searches: its dimension and box limits, the metric it measures paths with and the straight
/// interpolation its edges follow. The planners know nothing else of the arm.
/// </summary>
public interface IConfigurationSpace
{
    int Dimension { get; }

    ReadOnlySpan<double> LowerLimits { get; }

    ReadOnlySpan<double> UpperLimits { get; }

    /// <summary>The metric paths are measured and nearest neighbours found with.</summary>
    double Distance(ReadOnlySpan<double> a, ReadOnlySpan<double> b);

    /// <summary>The configuration a fraction <paramref name="t"/> ∈ [0, 1] of the way along the edge a → b.</summary>
    double[] Interpolate(ReadOnlySpan<double> a, ReadOnlySpan<double> b, double t);

    /// <summary>
    /// The least time (s) the straight edge a → b can take from rest to rest (a lower bound on executing it); a space
    /// without speed limits gives its <see cref="Distance"/>.
    /// </summary>
    double TravelTimeS(ReadOnlySpan<double> a, ReadOnlySpan<double> b);

    /// <summary>A configuration drawn uniformly within the limits.</summary>
    double[] SampleUniform(DeterministicRandom random);

    /// <summary>Clamps every coordinate into its limits.</summary>
    void Clamp(Span<double> q);
}
