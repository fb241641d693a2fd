using Orchard.Core.Collision;
using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;

namespace Orchard.Core.Demo;

/// <summary>
/// The demo machine folded in its stow configuration at a stand, as capsules in the tree frame (links,
/// shear and the lift mast): what the generator keeps the wood away from. Growers hedge the canopy so
/// the platform can pass down the alley with its arm stowed; the demo's trees are hedged the same way.
/// </summary>
internal sealed class StowedArmEnvelope
{
    private readonly Capsule[] _capsules;

    public StowedArmEnvelope(ArmProfile arm, ArmBasePose stand)
    {
        var chain = new KinematicChain(arm, KinematicChain.BasePoseInTree(stand));
        var model = new ArmCollisionModel(arm, chain);
        var frames = new Pose3[chain.JointCount];
        chain.ForwardKinematics(arm.StowConfiguration.ToArray(), frames);
        var tool = frames[^1] * chain.ToolInLastLink;
        _capsules = model.LocalCapsules
            .Select((c, i) => c.Transformed(model.LinkOfCapsule[i] == model.ToolLink ? tool : frames[model.LinkOfCapsule[i]]))
            .Concat(model.BaseCapsulesInRoot)
            .ToArray();
    }

    /// <summary>Smallest surface distance from a piece of wood (a capsule) to the stowed arm, metres.</summary>
    public double ClearanceM(in Vec3 from, in Vec3 to, double radiusM)
    {
        var wood = new Capsule(from, to, radiusM);
        var best = double.PositiveInfinity;
        foreach (var c in _capsules)
        {
            best = Math.Min(best, CapsuleDistance.SignedDistance(wood, c));
        }

        return best;
    }
}
