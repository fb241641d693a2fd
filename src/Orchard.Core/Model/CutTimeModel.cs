namespace Orchard.Core.Model;

/// <summary>
/// Seconds the shear needs to close, cut and reopen on wood of diameter d (mm):
/// t(d) = <see cref="BaseSeconds"/> + <see cref="SecondsPerMm"/>·d + <see cref="SecondsPerMm2"/>·d².
/// The square term follows the cut cross-section, which grows with d².
/// </summary>
public sealed record CutTimeModel(double BaseSeconds, double SecondsPerMm, double SecondsPerMm2)
{
    public double SecondsFor(double diameterMm) =>
        BaseSeconds + (SecondsPerMm * diameterMm) + (SecondsPerMm2 * diameterMm * diameterMm);
}
