namespace Orchard.Core.Tests.Geometry;

/// <summary>The families of random segment pairs the property tests draw from.</summary>
internal enum SegmentPairKind
{
    General,
    Parallel,
    Collinear,
    Crossing,
    Touching,
    FirstDegenerate,
    SecondDegenerate,
    BothDegenerate,
    NearlyParallel,
    AxisAlignedGrid,
}
