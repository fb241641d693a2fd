namespace Orchard.Core.Sequencing;

/// <summary>
/// The arc costs of one stop's tour in one flat n × n array (integer milliseconds: move time plus the
/// next node's service), with what is known about each arc: planned (exact: a planned or probed-free
/// move), or probed and blocked (a guessed detour cost until planned). Rule penalties (retry now / last)
/// are a view over it (<see cref="WithPenalties"/>), never written into it.
/// </summary>
internal sealed class ArcCostMatrix
{
    /// <summary>Larger than any tour's cost: arcs carrying it are used only if nothing else is possible.</summary>
    public const long RulePenaltyMs = 1_000_000_000;

    /// <summary>Cost of a move the planner could not find, so the solver avoids it (1,000 s: more than any tree takes).</summary>
    public const long UnplannableMs = 1_000_000;

    private readonly long[] _costs;
    private readonly bool[] _planned;
    private readonly bool[] _probed;

    public ArcCostMatrix(int nodeCount)
    {
        NodeCount = nodeCount;
        _costs = new long[nodeCount * nodeCount];
        _planned = new bool[nodeCount * nodeCount];
        _probed = new bool[nodeCount * nodeCount];
    }

    public int NodeCount { get; }

    public long this[int from, int to]
    {
        get => _costs[(from * NodeCount) + to];
        set => _costs[(from * NodeCount) + to] = value;
    }

    public bool IsPlanned(int from, int to) => _planned[(from * NodeCount) + to];

    public bool IsProbed(int from, int to) => _probed[(from * NodeCount) + to];

    public void MarkPlanned(int from, int to) => _planned[(from * NodeCount) + to] = true;

    public void MarkProbed(int from, int to) => _probed[(from * NodeCount) + to] = true;

    /// <summary>The matrix as the solver reads it, with the rule penalties added on the fly.</summary>
    /// <param name="first">Nodes that alone may follow the start (retry now); empty for no such rule.</param>
    /// <param name="last">Nodes that no node may follow (retry last); empty for no such rule.</param>
    public IReadOnlyList<IReadOnlyList<long>> WithPenalties(IReadOnlySet<int> first, IReadOnlySet<int> last) =>
        Enumerable.Range(0, NodeCount).Select(i => (IReadOnlyList<long>)new Row(this, i, first, last)).ToArray();

    public static long Ms(double seconds) => (long)Math.Round(seconds * 1000, MidpointRounding.AwayFromZero);

    private sealed class Row(ArcCostMatrix matrix, int from, IReadOnlySet<int> first, IReadOnlySet<int> last) : IReadOnlyList<long>
    {
        public int Count => matrix.NodeCount;

        public long this[int to]
        {
            get
            {
                var cost = matrix[from, to];
                if (from == 0 && to != 0 && first.Count > 0 && !first.Contains(to))
                {
                    cost += RulePenaltyMs;
                }

                if (to != 0 && to != from && last.Contains(from))
                {
                    cost += RulePenaltyMs;
                }

                return cost;
            }
        }

        public IEnumerator<long> GetEnumerator()
        {
            for (var j = 0; j < Count; j++)
            {
                yield return this[j];
            }
        }

        System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
    }
}
