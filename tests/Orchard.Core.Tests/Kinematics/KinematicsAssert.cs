using Orchard.Core.Geometry;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Kinematics;

internal static class KinematicsAssert
{
    public static void Near(in Vec3 expected, in Vec3 actual, double tolerance, string what)
    {
        var distance = Vec3.Distance(expected, actual);
        Assert.True(distance <= tolerance, $"{what}: expected {expected}, got {actual} (off by {distance:E3}).");
    }

    public static void Near(in Rot3 expected, in Rot3 actual, double tolerance, string what)
    {
        ReadOnlySpan<double> e = [expected.M00, expected.M01, expected.M02, expected.M10, expected.M11, expected.M12, expected.M20, expected.M21, expected.M22];
        ReadOnlySpan<double> a = [actual.M00, actual.M01, actual.M02, actual.M10, actual.M11, actual.M12, actual.M20, actual.M21, actual.M22];
        for (var i = 0; i < 9; i++)
        {
            Assert.True(Math.Abs(e[i] - a[i]) <= tolerance, $"{what}: entry {i / 3},{i % 3} expected {e[i]}, got {a[i]}.");
        }
    }

    public static void Near(in Pose3 expected, in Pose3 actual, double tolerance, string what)
    {
        Near(expected.Rotation, actual.Rotation, tolerance, what + " rotation");
        Near(expected.Translation, actual.Translation, tolerance, what + " translation");
    }

    /// <summary>A configuration uniform within [lower + margin, upper − margin] per joint.</summary>
    public static double[] RandomConfiguration(DeterministicRandom random, ReadOnlySpan<double> lower, ReadOnlySpan<double> upper, double margin = 0)
    {
        var q = new double[lower.Length];
        for (var i = 0; i < q.Length; i++)
        {
            q[i] = random.NextDouble(lower[i] + margin, upper[i] - margin);
        }

        return q;
    }

    /// <summary>Position distance and rotation angle between two poses.</summary>
    public static (double PositionM, double AngleRad) PoseDistance(in Pose3 a, in Pose3 b) =>
        (Vec3.Distance(a.Translation, b.Translation), (a.Rotation * b.Rotation.Transposed).ToRotationVector().Length);
}
