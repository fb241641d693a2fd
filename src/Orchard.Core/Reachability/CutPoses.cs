using Orchard.Core.Geometry;

namespace Orchard.Core.Reachability;

/// <summary>
/// Shear poses at a cut. The tool frame (see <see cref="Model.ShearTool"/>) has z along the approach,
/// y along the branch and x across it, so the jaws, closing along x, close across the branch axis.
/// </summary>
public static class CutPoses
{
    /// <summary>
    /// The approach direction facing the arm: perpendicular to the branch, pointing from the arm's
    /// side towards the cut. Taken from the horizontal line to the arm's base; when the branch points
    /// straight at the arm, from above (the shear comes down onto the branch).
    /// </summary>
    public static Vec3 FacingApproach(in Vec3 cutPoint, in Vec3 branchAxis, in Vec3 armBase)
    {
        var towardsArm = new Vec3(armBase.X - cutPoint.X, armBase.Y - cutPoint.Y, 0);
        var perpendicular = towardsArm - (branchAxis * Vec3.Dot(towardsArm, branchAxis));
        if (perpendicular.Length < 0.2 * towardsArm.Length || perpendicular.Length < 1e-9)
        {
            var up = Vec3.UnitZ;
            perpendicular = up - (branchAxis * Vec3.Dot(up, branchAxis));
            if (perpendicular.Length < 1e-9)
            {
                // A vertical branch pointing at nothing in particular: approach along −x of the tree frame.
                perpendicular = Vec3.UnitX - (branchAxis * Vec3.Dot(Vec3.UnitX, branchAxis));
            }
        }

        return -perpendicular.Normalized();
    }

    /// <summary>
    /// The TCP pose at the cut for an approach turned by <paramref name="angleRad"/> about the branch
    /// from <paramref name="facing"/>; with <paramref name="flipped"/>, the shear is turned half a turn
    /// about the approach (tool x and y reversed).
    /// </summary>
    public static Pose3 ShearPose(in Vec3 cutPoint, in Vec3 branchAxis, in Vec3 facing, double angleRad, bool flipped)
    {
        var z = (Rot3.AxisAngle(branchAxis, angleRad) * facing).Normalized();
        var y = flipped ? -branchAxis : branchAxis;

        // Re-orthogonalise y against z so the frame is exactly a rotation.
        y = (y - (z * Vec3.Dot(y, z))).Normalized();
        var x = Vec3.Cross(y, z);
        return new Pose3(Rot3.FromColumns(x, y, z), cutPoint);
    }

    /// <summary>The same pose moved back along its approach (tool −z) by <paramref name="distanceM"/>.</summary>
    public static Pose3 BackedOff(in Pose3 pose, double distanceM) =>
        new(pose.Rotation, pose.Translation - (pose.Rotation.ColumnZ * distanceM));
}
