using Orchard.Core.Model;

namespace Orchard.Core.Tests.Validation;

/// <summary>A small hand-made valid scan and helpers that change one thing about it.</summary>
internal static class SampleScans
{
    /// <summary>A 2.2 m leader in two pieces with one lateral, one wire, two cuts.</summary>
    public static TreeScan Valid() => new(
        TreeId: "T-1",
        Block: "Test block",
        Row: "R1",
        PositionInRow: 1,
        ScannedAt: new DateTimeOffset(2026, 1, 5, 8, 0, 0, TimeSpan.Zero),
        ArmBase: new ArmBasePose(new Vector3M(0, 0.95, 0.4), -Math.PI / 2),
        Nodes:
        [
            new ScanNode("n0", 0, 0, 0),
            new ScanNode("n1", 0, 0, 1.0),
            new ScanNode("n2", 0, 0, 2.2),
            new ScanNode("n3", 0.4, 0, 1.1),
        ],
        Branches:
        [
            new Branch("b0", "n0", "n1", 0.02, 0.015),
            new Branch("b1", "n1", "n2", 0.015, 0.005),
            new Branch("b2", "n1", "n3", 0.006, 0.003),
        ],
        Obstacles: [new Obstacle("wire-1", ObstacleKind.Wire, new Vector3M(-1.5, -0.06, 0.9), new Vector3M(1.5, -0.06, 0.9), 0.00125)],
        Cuts:
        [
            new Cut("c1", "b2", 0.1, CutKind.Thinning, 11.5),
            new Cut("c2", "b1", 0.5, CutKind.Heading, 20.0),
        ]);

    public static TreeScan WithNode(this TreeScan scan, int index, Func<ScanNode, ScanNode> change) =>
        scan with { Nodes = Replace(scan.Nodes, index, change) };

    public static TreeScan WithBranch(this TreeScan scan, int index, Func<Branch, Branch> change) =>
        scan with { Branches = Replace(scan.Branches, index, change) };

    public static TreeScan WithCut(this TreeScan scan, int index, Func<Cut, Cut> change) =>
        scan with { Cuts = Replace(scan.Cuts, index, change) };

    public static TreeScan WithObstacle(this TreeScan scan, int index, Func<Obstacle, Obstacle> change) =>
        scan with { Obstacles = Replace(scan.Obstacles, index, change) };

    public static IReadOnlyList<T> Replace<T>(IReadOnlyList<T> list, int index, Func<T, T> change)
    {
        var copy = list.ToArray();
        copy[index] = change(copy[index]);
        return copy;
    }
}
