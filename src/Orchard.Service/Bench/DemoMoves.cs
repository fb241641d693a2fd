using Orchard.Core.Collision;
using Orchard.Core.Demo;
using Orchard.Core.Reachability;

namespace Orchard.Service.Bench;

/// <summary>
/// The fixed move set of the planner benchmark: for each of the first demo trees (default seed), at the
/// tablet's stand, the clear configuration (where production moves start and end) or the pre-cut one of
/// every reachable cut's best candidate; moves are every pair of those (one direction) plus stow → each.
/// </summary>
internal static class DemoMoves
{
    public sealed record Move(int Tree, WorkCell Cell, double[] From, double[] To);

    public static IReadOnlyList<Move> Build(int trees, bool clearPoses, CancellationToken cancellationToken)
    {
        var arm = DemoArm.Create();
        var moves = new List<Move>();
        var demo = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: Math.Max(1, (trees + 5) / 6)));
        foreach (var (tree, index) in demo.Trees.Take(trees).Select((t, i) => (t, i)))
        {
            var cell = new WorkCell(tree.Scan, arm);
            var reach = ReachabilityAnalyzer.Analyze(cell, ReachabilitySettings.Default, DemoOrchardSettings.DefaultSeed, cancellationToken);
            var targets = reach.Where(r => r.IsReachable).Select(r => (clearPoses ? r.Candidates[0].ClearConfiguration : r.Candidates[0].PreCutConfiguration).ToArray()).ToList();
            var stow = arm.StowConfiguration.ToArray();
            foreach (var target in targets)
            {
                moves.Add(new Move(index, cell, stow, target));
            }

            for (var i = 0; i < targets.Count; i++)
            {
                for (var j = i + 1; j < targets.Count; j++)
                {
                    moves.Add(new Move(index, cell, targets[i], targets[j]));
                }
            }
        }

        return moves;
    }
}
