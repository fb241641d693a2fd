using Orchard.Core.Geometry;
using Orchard.Core.Model;

namespace Orchard.Core.Demo;

/// <summary>Collects the nodes and branches of a generated tree, rounding as a scanner's export would.</summary>
internal sealed class TreeWood
{
    public List<ScanNode> Nodes { get; } = [];

    public List<Branch> Branches { get; } = [];

    public List<Vec3> Positions { get; } = [];

    /// <summary>Coordinates to 0.1 mm, as a scanner exports them.</summary>
    public static double RoundM(double metres) => Math.Round(metres, 4, MidpointRounding.ToEven);

    /// <summary>Radii to 0.01 mm.</summary>
    public static double RoundRadiusM(double metres) => Math.Round(metres, 5, MidpointRounding.ToEven);

    public int AddNode(in Vec3 position)
    {
        var rounded = new Vec3(RoundM(position.X), RoundM(position.Y), RoundM(position.Z));
        var index = Nodes.Count;
        Nodes.Add(new ScanNode($"n{index}", rounded.X, rounded.Y, rounded.Z));
        Positions.Add(rounded);
        return index;
    }

    public int AddBranch(int fromNode, int toNode, double fromRadiusM, double toRadiusM)
    {
        var index = Branches.Count;
        Branches.Add(new Branch($"b{index}", Nodes[fromNode].Id, Nodes[toNode].Id, RoundRadiusM(fromRadiusM), RoundRadiusM(toRadiusM)));
        return index;
    }

    /// <summary>Wood diameter at a position along a branch, millimetres to 0.1 mm.</summary>
    public double DiameterMmAt(int branch, double positionAlong)
    {
        var b = Branches[branch];
        var radius = b.FromRadiusM + ((b.ToRadiusM - b.FromRadiusM) * positionAlong);
        return Math.Round(2000 * radius, 1, MidpointRounding.ToEven);
    }
}
