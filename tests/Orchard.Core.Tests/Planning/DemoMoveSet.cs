using Orchard.Core.Collision;
using Orchard.Core.Demo;
using Orchard.Core.Reachability;

namespace Orchard.Core.Tests.Planning;

/// <summary>A small fixed set of demo moves: pre-cut configurations of one demo tree's reachable cuts, pairwise, plus stow → each.</summary>
internal static class DemoMoveSet
{
    private static readonly Lazy<(WorkCell Cell, List<(double[] From, double[] To)> Moves)> Shared = new(Build);

    public static WorkCell Cell => Shared.Value.Cell;

    public static IReadOnlyList<(double[] From, double[] To)> Moves => Shared.Value.Moves;

    private static (WorkCell, List<(double[], double[])>) Build()
    {
        var tree = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 1)).Trees[1].Scan;
        var cell = new WorkCell(tree, DemoArm.Create());
        var targets = ReachabilityAnalyzer.Analyze(cell, ReachabilitySettings.Default, 11, CancellationToken.None)
            .Where(r => r.IsReachable).Select(r => r.Candidates[0].PreCutConfiguration.ToArray()).Take(9).ToList();
        var moves = targets.Select(t => (cell.Profile.StowConfiguration.ToArray(), t)).ToList();
        for (var i = 0; i < targets.Count; i++)
        {
            for (var j = i + 1; j < targets.Count; j++)
            {
                moves.Add((targets[i], targets[j]));
            }
        }

        return (cell, moves);
    }
}
