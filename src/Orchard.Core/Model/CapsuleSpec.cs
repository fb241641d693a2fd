namespace Orchard.Core.Model;

/// <summary>A collision capsule fixed to a link (or the tool), in that link's frame, metres.</summary>
public sealed record CapsuleSpec(Vector3M StartM, Vector3M EndM, double RadiusM);
