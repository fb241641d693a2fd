namespace Orchard.Core.Sequencing;

/// <summary>
/// A single-vehicle sequencing problem: an asymmetric cost matrix in whole units (the sequencer uses
/// milliseconds), a start node, and whether the tour returns to it. Optionally a generalised TSP: each
/// group is a set of alternative nodes of which exactly one is visited; a node in no group (other than the
/// start) is a mandatory visit on its own. Optionally precedences between groups. The shape is checked
/// when the problem is made; every rule broken throws an <see cref="ArgumentException"/> that says which.
/// </summary>
public sealed class TourProblem
{
    /// <summary>
    /// Largest cost of one arc: 2^40 (about 35 years in milliseconds). A tour of <see cref="MaxNodeCount"/>
    /// arcs then sums to under 2^53, far from overflow, and still exact in a double.
    /// </summary>
    public const long MaxArcCost = 1L << 40;

    /// <summary>Most nodes in one problem: the dense matrix is then 128 MiB of costs.</summary>
    public const int MaxNodeCount = 4096;

    private readonly long[] _costs;
    private readonly int[] _visitSetOf;

    /// <param name="costs">costs[i][j] is the cost of going from node i to node j; the diagonal is ignored.</param>
    /// <param name="start">The node every tour starts at; it may not be in a group.</param>
    /// <param name="kind">Closed (back to the start) or open (ends anywhere).</param>
    /// <param name="groups">Sets of alternative nodes, exactly one visited from each; disjoint; may be null.</param>
    /// <param name="precedences">Group-before-group rules over <paramref name="groups"/>; must not form a cycle; may be null.</param>
    public TourProblem(
        IReadOnlyList<IReadOnlyList<long>> costs,
        int start = 0,
        TourKind kind = TourKind.Closed,
        IReadOnlyList<IReadOnlyList<int>>? groups = null,
        IReadOnlyList<GroupPrecedence>? precedences = null)
    {
        ArgumentNullException.ThrowIfNull(costs);
        var n = costs.Count;
        if (n == 0)
        {
            throw new ArgumentException("The cost matrix is empty; a problem needs at least its start node.", nameof(costs));
        }

        if (n > MaxNodeCount)
        {
            throw new ArgumentException($"The cost matrix has {n} nodes; at most {MaxNodeCount} are allowed.", nameof(costs));
        }

        if (!Enum.IsDefined(kind))
        {
            throw new ArgumentOutOfRangeException(nameof(kind), kind, "Tour kind must be Closed or Open.");
        }

        _costs = new long[n * n];
        for (var i = 0; i < n; i++)
        {
            var row = costs[i] ?? throw new ArgumentException($"Row {i} of the cost matrix is null.", nameof(costs));
            if (row.Count != n)
            {
                throw new ArgumentException($"Row {i} of the cost matrix has {row.Count} entries; a {n}-node problem needs {n} in every row.", nameof(costs));
            }

            for (var j = 0; j < n; j++)
            {
                if (i == j)
                {
                    continue;
                }

                var c = row[j];
                if (c < 0 || c > MaxArcCost)
                {
                    throw new ArgumentException($"Cost from node {i} to node {j} is {c}; costs must be from 0 to {MaxArcCost}.", nameof(costs));
                }

                _costs[(i * n) + j] = c;
            }
        }

        if (start < 0 || start >= n)
        {
            throw new ArgumentOutOfRangeException(nameof(start), start, $"The start node must be one of the {n} nodes (0 to {n - 1}).");
        }

        NodeCount = n;
        Start = start;
        Kind = kind;

        _visitSetOf = new int[n];
        Array.Fill(_visitSetOf, -1);
        var groupList = new List<int[]>();
        if (groups is not null)
        {
            for (var g = 0; g < groups.Count; g++)
            {
                var group = groups[g] ?? throw new ArgumentException($"Group {g} is null.", nameof(groups));
                if (group.Count == 0)
                {
                    throw new ArgumentException($"Group {g} is empty; a group needs at least one node.", nameof(groups));
                }

                foreach (var node in group)
                {
                    if (node < 0 || node >= n)
                    {
                        throw new ArgumentException($"Group {g} names node {node}, which is not one of the {n} nodes.", nameof(groups));
                    }

                    if (node == start)
                    {
                        throw new ArgumentException($"Group {g} holds the start node {start}; the start is always visited first and may not be in a group.", nameof(groups));
                    }

                    if (_visitSetOf[node] >= 0)
                    {
                        throw new ArgumentException(
                            _visitSetOf[node] == g
                                ? $"Group {g} names node {node} twice."
                                : $"Node {node} is in both group {_visitSetOf[node]} and group {g}; groups must be disjoint.",
                            nameof(groups));
                    }

                    _visitSetOf[node] = g;
                }

                groupList.Add([.. group]);
            }
        }

        Groups = groupList;
        var visitSets = new List<int[]>(groupList);
        for (var node = 0; node < n; node++)
        {
            if (node != start && _visitSetOf[node] < 0)
            {
                _visitSetOf[node] = visitSets.Count;
                visitSets.Add([node]);
            }
        }

        VisitSets = visitSets;

        var precedenceList = new List<GroupPrecedence>();
        if (precedences is not null)
        {
            foreach (var p in precedences)
            {
                if (p.Before < 0 || p.Before >= groupList.Count || p.After < 0 || p.After >= groupList.Count)
                {
                    throw new ArgumentException($"Precedence {p.Before} → {p.After} names a group that does not exist; there are {groupList.Count} groups.", nameof(precedences));
                }

                if (p.Before == p.After)
                {
                    throw new ArgumentException($"Precedence {p.Before} → {p.After} asks a group to come before itself.", nameof(precedences));
                }

                precedenceList.Add(p);
            }
        }

        Precedences = precedenceList;
        ThrowIfCyclic(groupList.Count, precedenceList);
    }

    public int NodeCount { get; }

    public int Start { get; }

    public TourKind Kind { get; }

    /// <summary>The groups as given: sets of alternatives, exactly one node of each is visited.</summary>
    public IReadOnlyList<IReadOnlyList<int>> Groups { get; }

    public IReadOnlyList<GroupPrecedence> Precedences { get; }

    /// <summary>
    /// Everything a tour must visit besides the start: the groups (same indices as <see cref="Groups"/>)
    /// followed by one singleton for each node in no group. Every non-start node is in exactly one.
    /// </summary>
    public IReadOnlyList<IReadOnlyList<int>> VisitSets { get; }

    /// <summary>How many nodes every feasible tour lists, the start included.</summary>
    public int TourLength => VisitSets.Count + 1;

    public long Cost(int from, int to)
    {
        if ((uint)from >= (uint)NodeCount || (uint)to >= (uint)NodeCount)
        {
            throw new ArgumentOutOfRangeException(from < 0 || from >= NodeCount ? nameof(from) : nameof(to), "Not a node of this problem.");
        }

        return _costs[(from * NodeCount) + to];
    }

    /// <summary>The matrix as rows, diagonal zero: a copy the caller may keep.</summary>
    public long[][] CostRows()
    {
        var rows = new long[NodeCount][];
        for (var i = 0; i < NodeCount; i++)
        {
            rows[i] = _costs.AsSpan(i * NodeCount, NodeCount).ToArray();
        }

        return rows;
    }

    /// <summary>The visit set (see <see cref="VisitSets"/>) a node belongs to, or −1 for the start.</summary>
    public int VisitSetOf(int node) => _visitSetOf[node];

    /// <summary>Sum of the arcs along <paramref name="visits"/>, plus the arc back to the first node when the tour is closed.</summary>
    public long TourCost(IReadOnlyList<int> visits)
    {
        ArgumentNullException.ThrowIfNull(visits);
        long total = 0;
        for (var i = 0; i + 1 < visits.Count; i++)
        {
            total += Cost(visits[i], visits[i + 1]);
        }

        if (Kind == TourKind.Closed && visits.Count > 1)
        {
            total += Cost(visits[^1], visits[0]);
        }

        return total;
    }

    /// <summary>
    /// Why <paramref name="visits"/> is not a feasible tour of this problem, or null when it is: it starts at
    /// the start, lists every node at most once and exactly one node of every visit set, and respects
    /// every precedence.
    /// </summary>
    public string? FindViolation(IReadOnlyList<int> visits)
    {
        ArgumentNullException.ThrowIfNull(visits);
        if (visits.Count == 0 || visits[0] != Start)
        {
            return $"The tour must begin at the start node {Start}.";
        }

        var positionOfSet = new int[VisitSets.Count];
        Array.Fill(positionOfSet, -1);
        var seen = new bool[NodeCount];
        seen[Start] = true;
        for (var i = 1; i < visits.Count; i++)
        {
            var node = visits[i];
            if (node < 0 || node >= NodeCount)
            {
                return $"Position {i} holds {node}, which is not a node of this problem.";
            }

            if (seen[node])
            {
                return $"Node {node} is visited twice.";
            }

            seen[node] = true;
            var set = _visitSetOf[node];
            if (positionOfSet[set] >= 0)
            {
                return $"Node {node} and node {visits[positionOfSet[set]]} are alternatives of the same group {set}; exactly one may be visited.";
            }

            positionOfSet[set] = i;
        }

        for (var s = 0; s < VisitSets.Count; s++)
        {
            if (positionOfSet[s] < 0)
            {
                return s < Groups.Count
                    ? $"No node of group {s} is visited."
                    : $"Node {VisitSets[s][0]} is never visited.";
            }
        }

        foreach (var p in Precedences)
        {
            if (positionOfSet[p.Before] > positionOfSet[p.After])
            {
                return $"Group {p.After} (node {visits[positionOfSet[p.After]]}) is visited before group {p.Before} (node {visits[positionOfSet[p.Before]]}), against their precedence.";
            }
        }

        return null;
    }

    private static void ThrowIfCyclic(int groupCount, List<GroupPrecedence> precedences)
    {
        if (precedences.Count == 0)
        {
            return;
        }

        // Kahn's algorithm; whatever keeps a positive in-degree lies on or behind a cycle.
        var inDegree = new int[groupCount];
        var successors = new List<int>[groupCount];
        for (var g = 0; g < groupCount; g++)
        {
            successors[g] = [];
        }

        foreach (var p in precedences)
        {
            successors[p.Before].Add(p.After);
            inDegree[p.After]++;
        }

        var ready = new Queue<int>(Enumerable.Range(0, groupCount).Where(g => inDegree[g] == 0));
        var done = 0;
        while (ready.TryDequeue(out var g))
        {
            done++;
            foreach (var next in successors[g])
            {
                if (--inDegree[next] == 0)
                {
                    ready.Enqueue(next);
                }
            }
        }

        if (done < groupCount)
        {
            var stuck = Enumerable.Range(0, groupCount).Where(g => inDegree[g] > 0).Take(10);
            throw new ArgumentException($"The precedences form a cycle, so no tour can respect them all (groups on or behind the cycle: {string.Join(", ", stuck)}).", nameof(precedences));
        }
    }
}
