using Orchard.Core.Geometry;
using Orchard.Core.Kinematics;
using Orchard.Core.Model;

namespace Orchard.Core.Collision;

/// <summary>
/// One arm at one tree: the scan, the arm profile, the arm's chain placed where the platform stands
/// (root frame = tree frame), its collision model and the scene. Immutable and shared; make a
/// <see cref="CollisionChecker"/> per thread with <see cref="CreateChecker"/>.
/// </summary>
public sealed class WorkCell
{
    public WorkCell(TreeScan scan, ArmProfile profile, CollisionSettings? settings = null, Scene? scene = null)
    {
        Scan = scan ?? throw new ArgumentNullException(nameof(scan));
        Profile = profile ?? throw new ArgumentNullException(nameof(profile));
        Settings = settings ?? CollisionSettings.Default;
        Chain = new KinematicChain(profile, KinematicChain.BasePoseInTree(scan.ArmBase));
        Arm = new ArmCollisionModel(profile, Chain);
        Scene = scene ?? Scene.FromScan(scan);
    }

    public TreeScan Scan { get; }

    public ArmProfile Profile { get; }

    public CollisionSettings Settings { get; }

    public KinematicChain Chain { get; }

    public ArmCollisionModel Arm { get; }

    public Scene Scene { get; }

    /// <summary>Where the arm's base frame stands, in the tree frame.</summary>
    public Vec3 BasePositionM => Chain.BaseInRoot.Translation;

    /// <summary>The same arm and tree with another scene (e.g. with cut wood gone).</summary>
    public WorkCell WithScene(Scene scene) => new(Scan, Profile, Settings, scene);

    public CollisionChecker CreateChecker() => new(Scene, Arm, Settings);
}
