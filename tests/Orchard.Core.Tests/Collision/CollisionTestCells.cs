using Orchard.Core.Collision;
using Orchard.Core.Demo;
using Orchard.Core.Model;

namespace Orchard.Core.Tests.Collision;

/// <summary>
/// The demo orchard and arm shared by the collision and reachability tests, built once. Tree 0 (K1-001) has a
/// trellis post inside its scan; tree 13 (W1-002) is in the other block and has none.
/// </summary>
internal static class CollisionTestCells
{
    public const int TreeWithPost = 0;
    public const int TreeOtherBlock = 13;

    private static readonly Lazy<DemoOrchard> LazyOrchard = new(() => DemoOrchard.Generate());
    private static readonly Lazy<WorkCell>[] Cells = Enumerable.Range(0, 24)
        .Select(i => new Lazy<WorkCell>(() => new WorkCell(Orchard.Trees[i].Scan, DemoArm.Create())))
        .ToArray();

    public static DemoOrchard Orchard => LazyOrchard.Value;

    public static ArmProfile Profile { get; } = DemoArm.Create();

    public static WorkCell Cell(int tree) => Cells[tree].Value;

    /// <summary>The arm standing where <paramref name="scan"/> puts it, with nothing around it but the ground.</summary>
    public static TreeScan EmptyScan(TreeScan scan) => scan with { Nodes = [], Branches = [], Obstacles = [], Cuts = [] };
}
