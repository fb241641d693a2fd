namespace Orchard.Core.Model;

/// <summary>A point or offset in metres, in whatever frame its owner names.</summary>
public sealed record Vector3M(double X, double Y, double Z)
{
    public static Vector3M Zero { get; } = new(0, 0, 0);
}
