using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Model;

namespace Orchard.Core.Stops;

/// <summary>
/// A cheap, conservative test of whether a point can be within the shear's reach from a stand: the
/// origin of the first revolute joint (the shoulder, carried by any lift before it) stays inside a box
/// (the corners of the lifts' travel), and no point of the arm gets farther from that origin than the
/// arm model's reach bound. A point farther than that from the box is out of reach for certain; one
/// nearer may still be, which the full reachability analysis decides. Used only to rank stands.
/// </summary>
public sealed class ReachEnvelope
{
    private readonly Aabb _shoulderBox;
    private readonly double _reachM;

    public ReachEnvelope(WorkCell cell)
    {
        ArgumentNullException.ThrowIfNull(cell);
        var chain = cell.Chain;
        var n = chain.JointCount;
        var firstRevolute = 0;
        while (firstRevolute < n && chain.JointKinds[firstRevolute] == JointKind.Prismatic)
        {
            firstRevolute++;
        }

        var frames = new Pose3[n];
        var q = new double[n];
        var box = Aabb.Empty;
        var corners = 1 << Math.Min(firstRevolute, 8);
        for (var corner = 0; corner < corners; corner++)
        {
            for (var j = 0; j < n; j++)
            {
                q[j] = j < firstRevolute
                    ? ((corner >> j) & 1) == 0 ? chain.LowerLimits[j] : chain.UpperLimits[j]
                    : Math.Clamp(0, chain.LowerLimits[j], chain.UpperLimits[j]);
            }

            chain.ForwardKinematics(q, frames);
            var origin = firstRevolute < n ? frames[firstRevolute].Translation : (frames[^1] * chain.ToolInLastLink).Translation;
            box = Aabb.Union(box, new Aabb(origin, origin));
        }

        _shoulderBox = box;
        _reachM = firstRevolute < n ? cell.Arm.ReachFromJoint[firstRevolute, cell.Arm.ToolLink] : 0;
    }

    /// <summary>Can the point be within reach at all (false: certainly not)?</summary>
    public bool MayReach(in Vec3 pointM) => Aabb.DistanceSquared(_shoulderBox, new Aabb(pointM, pointM)) <= _reachM * _reachM;
}
