namespace Orchard.Core.Demo;

/// <summary>What a generated limb is, for the pruning rules.</summary>
internal enum LimbKind
{
    Leader,
    Lateral,
    SideShoot,
    UprightShoot,
}

/// <summary>
/// A limb of a generated tree as the pruning rules see it: a chain of branches from where it attaches
/// (its first branch starts at a node of its parent) to its tip.
/// </summary>
internal sealed class Limb(LimbKind kind, Limb? parent, double attachHeightM, double azimuthRad, double baseDiameterMm, double parentDiameterAtAttachMm)
{
    public LimbKind Kind { get; } = kind;

    public Limb? Parent { get; } = parent;

    public double AttachHeightM { get; } = attachHeightM;

    /// <summary>Direction of the limb around the leader, from +x (along the row) towards +y (the aisle).</summary>
    public double AzimuthRad { get; } = azimuthRad;

    public double BaseDiameterMm { get; } = baseDiameterMm;

    public double ParentDiameterAtAttachMm { get; } = parentDiameterAtAttachMm;

    /// <summary>Branch indices from the attachment outwards.</summary>
    public List<int> Branches { get; } = [];

    /// <summary>Length of each branch in <see cref="Branches"/>, metres.</summary>
    public List<double> SegmentLengthsM { get; } = [];

    public List<Limb> Children { get; } = [];

    public double LengthM => SegmentLengthsM.Sum();

    /// <summary>Set once a pruning rule removes this limb.</summary>
    public bool Removed { get; set; }
}
