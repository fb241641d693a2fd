namespace Orchard.Core.Collision;

/// <summary>
/// The capsule pairs a configuration check tests against each other, laid out for four-lane tests: the arm's self
/// pairs, then each moving capsule against each base capsule (index past the moving ones), padded to a multiple of
/// four; <see cref="Radius"/> is the sum of both bounding-sphere radii.
/// </summary>
internal sealed class SpherePairs
{
    public SpherePairs(ArmCollisionModel arm)
    {
        var moving = arm.LocalCapsules.Length;
        var pairs = arm.SelfPairs.Select(p => (p.A, p.B, R: arm.BoundingRadius[p.A] + arm.BoundingRadius[p.B])).ToList();
        foreach (var i in arm.BasePairs)
        {
            for (var k = 0; k < arm.BaseCapsulesInRoot.Length; k++)
            {
                pairs.Add((i, moving + k, arm.BoundingRadius[i] + arm.BaseBoundingRadius[k]));
            }
        }

        Length = pairs.Count;
        var padded = (pairs.Count + 3) / 4 * 4;
        A = new int[padded];
        B = new int[padded];
        Radius = new double[padded];
        for (var p = 0; p < pairs.Count; p++)
        {
            (A[p], B[p], Radius[p]) = pairs[p];
        }
    }

    /// <summary>Pairs without the padding.</summary>
    public int Length { get; }

    public int[] A { get; }

    public int[] B { get; }

    public double[] Radius { get; }

    /// <summary>Lanes of the group starting at <paramref name="start"/> that hold a pair (the padding's are off).</summary>
    public uint LaneMask(int start) => Length - start >= 4 ? 0b1111u : (1u << (Length - start)) - 1;
}
