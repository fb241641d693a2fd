namespace Orchard.Core.Timing;

/// <summary>How <see cref="PathTiming"/> rounds corners and caps speeds. Defaults in brackets.</summary>
/// <param name="BlendFraction">A corner's blend reaches at most this share of half the shorter adjacent segment [1: up to half; 0: stop at every corner].</param>
/// <param name="MaxBlendLength">… and at most this far along each segment, in joint space (joint units, Euclidean) [0.3].</param>
/// <param name="SegmentSpeedCaps">Optional path-speed caps per segment (joint-space length per second), indexed by the waypoint a segment starts at; e.g. a tool speed near the wood.</param>
/// <param name="SegmentAccelerationCaps">Optional path-acceleration caps per segment, indexed likewise.</param>
/// <param name="CornerBlendScales">Optional scale of each corner's blend, indexed by the corner's waypoint: 1 as computed, smaller to keep closer to the corner, 0 to stop there.</param>
public sealed record PathTimingOptions(
    double BlendFraction = 1.0,
    double MaxBlendLength = 0.3,
    IReadOnlyList<double>? SegmentSpeedCaps = null,
    IReadOnlyList<double>? SegmentAccelerationCaps = null,
    IReadOnlyList<double>? CornerBlendScales = null)
{
    public static PathTimingOptions Default { get; } = new();

    /// <summary>Stops at every waypoint: the rest-to-rest timing.</summary>
    public static PathTimingOptions RestToRest { get; } = new(BlendFraction: 0);
}
