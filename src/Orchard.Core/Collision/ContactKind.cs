namespace Orchard.Core.Collision;

/// <summary>What stopped a configuration or an edge from being free.</summary>
public enum ContactKind
{
    None,
    JointLimit,
    Wood,
    Trellis,
    Ground,
    Self,
    Budget,
}
