namespace Orchard.Core.Sequencing.Tsplib;

/// <summary>
/// A TSPLIB instance (Reinelt, "TSPLIB — A Traveling Salesman Problem Library", ORSA J. Computing
/// 3(4):376–384, 1991) with its integer distances worked out as the library defines them. Nodes are
/// numbered from 0 here; TSPLIB's node k is node k − 1.
/// </summary>
public sealed class TsplibInstance
{
    private readonly long[][] _distances;

    internal TsplibInstance(string name, string type, string? comment, string edgeWeightType, string? edgeWeightFormat, IReadOnlyList<(double X, double Y)>? coordinates, long[][] distances)
    {
        Name = name;
        Type = type;
        Comment = comment;
        EdgeWeightType = edgeWeightType;
        EdgeWeightFormat = edgeWeightFormat;
        Coordinates = coordinates;
        _distances = distances;
    }

    public string Name { get; }

    /// <summary><c>TSP</c> (symmetric) or <c>ATSP</c> (asymmetric).</summary>
    public string Type { get; }

    public string? Comment { get; }

    public int Dimension => _distances.Length;

    /// <summary>As in the file, e.g. <c>EUC_2D</c> or <c>EXPLICIT</c>.</summary>
    public string EdgeWeightType { get; }

    /// <summary>For <c>EXPLICIT</c> weights, e.g. <c>FULL_MATRIX</c> or <c>UPPER_ROW</c>; otherwise null.</summary>
    public string? EdgeWeightFormat { get; }

    /// <summary>Node coordinates when the file has them (node 0 first).</summary>
    public IReadOnlyList<(double X, double Y)>? Coordinates { get; }

    public bool IsSymmetric => Type == "TSP";

    /// <summary>Distance from node <paramref name="from"/> to node <paramref name="to"/> (0-based), as TSPLIB defines it.</summary>
    public long Distance(int from, int to) => _distances[from][to];

    /// <summary>Length of the closed tour through <paramref name="tour"/> (0-based nodes), the closing edge included.</summary>
    public long ClosedTourLength(IReadOnlyList<int> tour)
    {
        ArgumentNullException.ThrowIfNull(tour);
        long total = 0;
        for (var i = 0; i < tour.Count; i++)
        {
            total += Distance(tour[i], tour[(i + 1) % tour.Count]);
        }

        return total;
    }

    /// <summary>The longest edge between two distinct nodes.</summary>
    public long LongestEdge()
    {
        long longest = 0;
        for (var i = 0; i < Dimension; i++)
        {
            for (var j = 0; j < Dimension; j++)
            {
                if (i != j && _distances[i][j] > longest)
                {
                    longest = _distances[i][j];
                }
            }
        }

        return longest;
    }

    /// <summary>This instance as a tour problem: its distances, the given start node (0-based) and kind.</summary>
    public TourProblem ToProblem(TourKind kind, int start = 0) => new(_distances, start, kind);
}
