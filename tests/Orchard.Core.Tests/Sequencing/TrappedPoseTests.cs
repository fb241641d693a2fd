using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>
/// The lazy search gives up on a pre-cut pose once enough moves to or from it were planned in full and failed while
/// none was found: its remaining moves count as unplannable, unplanned.
/// </summary>
public sealed class TrappedPoseTests
{
    private const long Found = 1_500;

    [Fact]
    public void A_pose_with_three_failed_moves_and_none_found_is_given_up_and_no_other_is()
    {
        // Node 0 is the start; nodes 1–5 are poses of five different cuts.
        var stop = new PoseMatrix(6);
        var (nodes, costs) = (stop.Nodes, stop.Costs);

        // Pose 3: three failures (into it from 0 and 1, out of it to 2). Pose 4: two failures. Pose 5: two failures
        // and one move found.
        stop.Planned(0, 3, ArcCostMatrix.UnplannableMs);
        stop.Planned(1, 3, ArcCostMatrix.UnplannableMs);
        stop.Planned(3, 2, ArcCostMatrix.UnplannableMs);
        stop.Planned(1, 4, ArcCostMatrix.UnplannableMs);
        stop.Planned(4, 2, ArcCostMatrix.UnplannableMs);
        stop.Planned(1, 5, ArcCostMatrix.UnplannableMs);
        stop.Planned(0, 5, ArcCostMatrix.UnplannableMs);
        stop.Planned(5, 1, Found);

        for (var v = 0; v < nodes.Length; v++)
        {
            LazyTourSearch.GiveUpIfTrapped(v, 3, nodes, costs);
        }

        // Every move of pose 3 is now settled as unplannable (never into the start).
        foreach (var u in new[] { 1, 2, 4, 5 })
        {
            Assert.True(costs.IsPlanned(u, 3) && costs[u, 3] >= ArcCostMatrix.UnplannableMs, $"{u} → 3");
            Assert.True(costs.IsPlanned(3, u) && costs[3, u] >= ArcCostMatrix.UnplannableMs, $"3 → {u}");
        }

        Assert.False(costs.IsPlanned(3, 0));

        // Poses 4 and 5 keep their unplanned moves: too few failures, or a move found; pose 2 too, though giving up
        // pose 3 settled 2 → 3 as well (settled moves are not failures: no cascade).
        Assert.Equal(LazyTourSearch.GivenUpMs, costs[2, 3]);
        Assert.False(costs.IsPlanned(4, 1));
        Assert.False(costs.IsPlanned(2, 4));
        Assert.False(costs.IsPlanned(5, 2));
        Assert.Equal(Found, costs[5, 1]);
    }
}
