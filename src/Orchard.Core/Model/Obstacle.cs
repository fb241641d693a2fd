namespace Orchard.Core.Model;

/// <summary>A fixed obstacle as a capsule (segment from <see cref="StartM"/> to <see cref="EndM"/>, swept by a sphere), tree frame.</summary>
public sealed record Obstacle(string Id, ObstacleKind Kind, Vector3M StartM, Vector3M EndM, double RadiusM);
