using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// The pose a missed move is joined through: the cheapest way over two found moves, the third pose's cut not
/// counted (the arm passes it without cutting); never the start, and none without found moves both ways.
/// </summary>
public sealed class ViaPoseTests
{
    [Fact]
    public void The_cheapest_way_through_one_other_pose_is_chosen_without_its_cut()
    {
        // Node 0 is the start; nodes 1–5 are poses of five different cuts. Pose 3's cut takes 4 s, pose 4's 1 s.
        var stop = new PoseMatrix(6, [0.0, 0, 0, 4, 1, 0]);
        var (nodes, costs) = (stop.Nodes, stop.Costs);

        // 1 → 2 failed. Through 3: (5,000 − 4,000) + 2,000 = 3,000 ms. Through 4: (2,500 − 1,000) + 2,000 = 3,500 ms.
        // Through 5: 1 → 5 found but 5 → 2 only guessed. Through the start: no move ends there.
        stop.Planned(1, 2, ArcCostMatrix.UnplannableMs);
        stop.Planned(1, 3, 5_000);
        stop.Planned(3, 2, 2_000);
        stop.Planned(1, 4, 2_500);
        stop.Planned(4, 2, 2_000);
        stop.Planned(1, 5, 500);
        costs.MarkProbed(5, 2);
        costs[5, 2] = 100;
        Assert.Equal(3, LazyTourSearch.BestVia(1, 2, nodes, costs));

        // A failed move is no way through: with 3 → 2 failed, 4 is the way.
        stop.Planned(3, 2, ArcCostMatrix.UnplannableMs);
        Assert.Equal(4, LazyTourSearch.BestVia(1, 2, nodes, costs));

        // Nothing found into 2 but the failure from 1: no way.
        stop.Planned(4, 2, LazyTourSearch.GivenUpMs);
        Assert.Equal(-1, LazyTourSearch.BestVia(1, 2, nodes, costs));
    }
}
