using Orchard.Core.Sequencing;

namespace Orchard.Core.Tests.Sequencing;

public sealed class TourProblemTests
{
    private static long[][] Square(int n, long value = 1) =>
        [.. Enumerable.Range(0, n).Select(i => Enumerable.Range(0, n).Select(j => i == j ? 0 : value).ToArray())];

    public static TheoryData<string, string> BrokenShapes => new()
    {
        { "empty matrix", "matrix is empty" },
        { "ragged row", "Row 1 of the cost matrix has 2 entries" },
        { "null row", "Row 2 of the cost matrix is null" },
        { "negative cost", "Cost from node 0 to node 2 is -1" },
        { "cost too large", "costs must be from 0 to" },
        { "start outside", "start node must be one of the 3 nodes" },
        { "empty group", "Group 0 is empty" },
        { "group holds start", "holds the start node 0" },
        { "node in two groups", "Node 1 is in both group 0 and group 1" },
        { "node twice in a group", "Group 0 names node 2 twice" },
        { "group node outside", "Group 0 names node 7" },
        { "precedence to no group", "names a group that does not exist" },
        { "self precedence", "before itself" },
        { "precedence cycle", "precedences form a cycle" },
    };

    [Theory]
    [MemberData(nameof(BrokenShapes))]
    public void Each_broken_rule_is_refused_with_a_message_that_names_it(string rule, string expected)
    {
        var ok = Square(3);
        Action make = rule switch
        {
            "empty matrix" => () => _ = new TourProblem(Array.Empty<long[]>()),
            "ragged row" => () => _ = new TourProblem([[0, 1, 1], [1, 0], [1, 1, 0]]),
            "null row" => () => _ = new TourProblem([[0, 1, 1], [1, 0, 1], null!]),
            "negative cost" => () => _ = new TourProblem([[0, 1, -1], [1, 0, 1], [1, 1, 0]]),
            "cost too large" => () => _ = new TourProblem([[0, 1, TourProblem.MaxArcCost + 1], [1, 0, 1], [1, 1, 0]]),
            "start outside" => () => _ = new TourProblem(ok, start: 3),
            "empty group" => () => _ = new TourProblem(ok, groups: [Array.Empty<int>()]),
            "group holds start" => () => _ = new TourProblem(ok, groups: [[0, 1]]),
            "node in two groups" => () => _ = new TourProblem(ok, groups: [[1], [1, 2]]),
            "node twice in a group" => () => _ = new TourProblem(ok, groups: [[2, 2]]),
            "group node outside" => () => _ = new TourProblem(ok, groups: [[7]]),
            "precedence to no group" => () => _ = new TourProblem(ok, groups: [[1], [2]], precedences: [new GroupPrecedence(0, 2)]),
            "self precedence" => () => _ = new TourProblem(ok, groups: [[1], [2]], precedences: [new GroupPrecedence(1, 1)]),
            "precedence cycle" => () => _ = new TourProblem(Square(4), groups: [[1], [2], [3]], precedences: [new(0, 1), new(1, 2), new(2, 0)]),
            _ => throw new ArgumentOutOfRangeException(nameof(rule), rule, null),
        };

        var ex = Assert.ThrowsAny<ArgumentException>(make);
        Assert.Contains(expected, ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_diagonal_is_ignored_and_visit_sets_are_the_groups_then_the_other_nodes()
    {
        var problem = new TourProblem([[9999, 1, 2, 3], [4, 9999, 5, 6], [7, 8, -5, 9], [1, 2, 3, 9999]], start: 1, groups: [[3, 0]]);
        Assert.Equal(0, problem.Cost(2, 2));
        Assert.Equal(5, problem.Cost(1, 2));
        Assert.Equal(2, problem.VisitSets.Count);
        Assert.Equal([3, 0], problem.VisitSets[0]);
        Assert.Equal([2], problem.VisitSets[1]);
        Assert.Equal(-1, problem.VisitSetOf(1));
        Assert.Equal(3, problem.TourLength);
    }

    [Fact]
    public void Tour_cost_pays_the_closing_arc_only_when_closed()
    {
        long[][] costs = [[0, 1, 10], [100, 0, 2], [1000, 20, 0]];
        Assert.Equal(1 + 2 + 1000, new TourProblem(costs, kind: TourKind.Closed).TourCost([0, 1, 2]));
        Assert.Equal(1 + 2, new TourProblem(costs, kind: TourKind.Open).TourCost([0, 1, 2]));
    }

    [Fact]
    public void Find_violation_names_what_is_wrong_and_accepts_a_feasible_tour()
    {
        var problem = new TourProblem(Square(6), start: 0, groups: [[1, 2], [3], [4]], precedences: [new GroupPrecedence(1, 2)]);
        Assert.Null(problem.FindViolation([0, 2, 3, 4, 5]));
        Assert.Contains("begin at the start", problem.FindViolation([1, 0, 3, 4, 5]), StringComparison.Ordinal);
        Assert.Contains("visited twice", problem.FindViolation([0, 3, 3, 4, 5]), StringComparison.Ordinal);
        Assert.Contains("same group 0", problem.FindViolation([0, 1, 2, 3, 4, 5]), StringComparison.Ordinal);
        Assert.Contains("No node of group 0", problem.FindViolation([0, 3, 4, 5]), StringComparison.Ordinal);
        Assert.Contains("Node 5 is never visited", problem.FindViolation([0, 1, 3, 4]), StringComparison.Ordinal);
        Assert.Contains("against their precedence", problem.FindViolation([0, 1, 4, 3, 5]), StringComparison.Ordinal);
        Assert.Contains("not a node", problem.FindViolation([0, 1, 3, 4, 9]), StringComparison.Ordinal);
    }
}
