using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;

namespace Orchard.Core.Collision;

/// <summary>
/// One arm at one tree: the scan, the arm profile, the arm's chain placed where the platform stands
/// (root frame = tree frame), its collision model and the scene. Immutable and shared; make a
/// <see cref="CollisionChecker"/> per thread with <see cref="CreateChecker"/>.
/// <para>
/// The arm model's analysis (self pairs, always-touching pairs, motion bounds) does not depend on where
/// the platform stands or what wood is left, so <see cref="AtStand"/> and <see cref="WithScene"/> share
/// it: only the chain's base pose and the base's capsules are placed anew.
/// </para>
/// </summary>
public sealed class WorkCell
{
    public WorkCell(TreeScan scan, ArmProfile profile, CollisionSettings? settings = null, Scene? scene = null)
    {
        Scan = scan ?? throw new ArgumentNullException(nameof(scan));
        Profile = profile ?? throw new ArgumentNullException(nameof(profile));
        Settings = settings ?? CollisionSettings.Default;
        ArmBase = scan.ArmBase;
        Chain = new KinematicChain(profile, KinematicChain.BasePoseInTree(scan.ArmBase));
        Arm = new ArmCollisionModel(profile, Chain);
        Scene = scene ?? Scene.FromScan(scan);
    }

    private WorkCell(WorkCell other, ArmBasePose armBase, KinematicChain chain, ArmCollisionModel arm, Scene scene)
    {
        Scan = other.Scan;
        Profile = other.Profile;
        Settings = other.Settings;
        ArmBase = armBase;
        Chain = chain;
        Arm = arm;
        Scene = scene;
    }

    public TreeScan Scan { get; }

    public ArmProfile Profile { get; }

    public CollisionSettings Settings { get; }

    /// <summary>Where the platform stands for this cell (the scan's stand, or a stop chosen by the service).</summary>
    public ArmBasePose ArmBase { get; }

    public KinematicChain Chain { get; }

    public ArmCollisionModel Arm { get; }

    public Scene Scene { get; }

    /// <summary>Where the arm's base frame stands, in the tree frame.</summary>
    public Vec3 BasePositionM => Chain.BaseInRoot.Translation;

    /// <summary>The same arm and tree with another scene (e.g. with cut wood gone); the arm model is shared.</summary>
    public WorkCell WithScene(Scene scene) => new(this, ArmBase, Chain, Arm, scene ?? throw new ArgumentNullException(nameof(scene)));

    /// <summary>The same arm and scene with the platform standing elsewhere; the arm model's analysis is shared.</summary>
    public WorkCell AtStand(ArmBasePose armBase)
    {
        ArgumentNullException.ThrowIfNull(armBase);
        var chain = Chain.WithBase(KinematicChain.BasePoseInTree(armBase));
        return new(this, armBase, chain, Arm.PlacedOn(chain, Profile), Scene);
    }

    public CollisionChecker CreateChecker() => new(Scene, Arm, Settings);
}
