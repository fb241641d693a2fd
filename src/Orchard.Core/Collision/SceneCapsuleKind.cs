namespace Orchard.Core.Collision;

/// <summary>What a scene capsule stands for.</summary>
public enum SceneCapsuleKind
{
    /// <summary>A piece of the tree's wood.</summary>
    Wood,

    /// <summary>A trellis wire.</summary>
    Wire,

    /// <summary>A trellis post or stake.</summary>
    Post,

    /// <summary>Any other obstacle the scan reported.</summary>
    Other,
}
