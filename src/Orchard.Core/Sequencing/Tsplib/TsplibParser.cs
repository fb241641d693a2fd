using System.Globalization;

namespace Orchard.Core.Sequencing.Tsplib;

/// <summary>
/// Reads the TSPLIB text format (Reinelt, "TSPLIB 95" documentation, Universität Heidelberg): a header of
/// <c>KEY : value</c> lines, then data sections, then an optional <c>EOF</c>. Pure: it parses the text it is
/// given and never opens a file. Supported: TYPE <c>TSP</c> and <c>ATSP</c>; EDGE_WEIGHT_TYPE <c>EUC_2D</c>
/// (nint of the Euclidean distance, <c>(int)(d + 0.5)</c>) and <c>EXPLICIT</c> with EDGE_WEIGHT_FORMAT
/// <c>FULL_MATRIX</c>, <c>UPPER_ROW</c>, <c>LOWER_ROW</c>, <c>UPPER_DIAG_ROW</c> or <c>LOWER_DIAG_ROW</c>
/// (the triangular ones for TSP only). Anything else is refused with a message naming it.
/// Malformed text throws <see cref="FormatException"/> with the line number.
/// </summary>
public static class TsplibParser
{
    private static readonly string[] Sections =
    [
        "NODE_COORD_SECTION", "EDGE_WEIGHT_SECTION", "TOUR_SECTION", "DISPLAY_DATA_SECTION",
        "DEPOT_SECTION", "DEMAND_SECTION", "FIXED_EDGES_SECTION", "EDGE_DATA_SECTION",
    ];

    public static TsplibInstance Parse(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var reader = new Reader(text);
        var header = new Dictionary<string, string>(StringComparer.Ordinal);
        (double X, double Y)[]? coordinates = null;
        long[]? weights = null;
        int? dimension = null;

        while (reader.NextLine() is { } line)
        {
            if (line == "EOF")
            {
                break;
            }

            var section = SectionOf(line);
            if (section is null)
            {
                var (key, value) = KeyValue(line, reader.LineNumber);
                if (!header.TryAdd(key, value))
                {
                    throw reader.Error($"{key} is given twice.");
                }

                if (key == "DIMENSION")
                {
                    dimension = int.TryParse(value, NumberStyles.Integer, CultureInfo.InvariantCulture, out var d) && d >= 1 && d <= TourProblem.MaxNodeCount
                        ? d
                        : throw reader.Error($"DIMENSION must be a whole number from 1 to {TourProblem.MaxNodeCount}; got '{value}'.");
                }

                continue;
            }

            var n = dimension ?? throw reader.Error($"{section} comes before DIMENSION.");
            switch (section)
            {
                case "NODE_COORD_SECTION":
                    coordinates = ReadCoordinates(reader, n);
                    break;
                case "EDGE_WEIGHT_SECTION":
                    weights = ReadNumbers(reader, WeightCount(header, n, reader), section);
                    break;
                case "DISPLAY_DATA_SECTION":
                    ReadCoordinates(reader, n); // Drawing positions only; distances never come from them.
                    break;
                default:
                    throw reader.Error($"{section} is not supported in an instance file.");
            }
        }

        var name = Required(header, "NAME");
        var type = Required(header, "TYPE");
        if (type is not ("TSP" or "ATSP"))
        {
            throw new NotSupportedException($"TSPLIB TYPE '{type}' is not supported; only TSP and ATSP are.");
        }

        var size = dimension ?? throw new FormatException("The file has no DIMENSION.");
        var edgeWeightType = Required(header, "EDGE_WEIGHT_TYPE");
        header.TryGetValue("EDGE_WEIGHT_FORMAT", out var format);
        header.TryGetValue("COMMENT", out var comment);
        long[][] distances;
        switch (edgeWeightType)
        {
            case "EUC_2D":
                distances = Euclidean(coordinates ?? throw new FormatException("EUC_2D needs a NODE_COORD_SECTION."));
                break;
            case "EXPLICIT":
                distances = Explicit(size, format ?? throw new FormatException("EXPLICIT weights need an EDGE_WEIGHT_FORMAT."), weights ?? throw new FormatException("EXPLICIT weights need an EDGE_WEIGHT_SECTION."), type);
                break;
            default:
                throw new NotSupportedException($"EDGE_WEIGHT_TYPE '{edgeWeightType}' is not supported; EUC_2D and EXPLICIT are.");
        }

        return new TsplibInstance(name, type, comment, edgeWeightType, edgeWeightType == "EXPLICIT" ? format : null, coordinates, distances);
    }

    /// <summary>Reads a <c>.tour</c> file: its first tour, which must list every node of DIMENSION exactly once.</summary>
    public static TsplibTour ParseTour(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var reader = new Reader(text);
        var header = new Dictionary<string, string>(StringComparer.Ordinal);
        List<int>? nodes = null;
        while (reader.NextLine() is { } line)
        {
            if (line == "EOF")
            {
                break;
            }

            var section = SectionOf(line);
            if (section is null)
            {
                var (key, value) = KeyValue(line, reader.LineNumber);
                if (!header.TryAdd(key, value))
                {
                    throw reader.Error($"{key} is given twice.");
                }

                continue;
            }

            if (section != "TOUR_SECTION")
            {
                throw reader.Error($"{section} is not expected in a tour file.");
            }

            nodes = [];
            var ended = false;
            while (!ended && reader.NextLine() is { } data)
            {
                foreach (var token in data.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries))
                {
                    if (!int.TryParse(token, NumberStyles.Integer, CultureInfo.InvariantCulture, out var id))
                    {
                        throw reader.Error($"'{token}' is not a node number.");
                    }

                    if (id == -1)
                    {
                        ended = true;
                        break;
                    }

                    nodes.Add(id - 1);
                }
            }

            if (!ended)
            {
                throw new FormatException("TOUR_SECTION does not end with -1.");
            }

            break; // Only the first tour is read.
        }

        var name = Required(header, "NAME");
        if (header.TryGetValue("TYPE", out var type) && type != "TOUR")
        {
            throw new FormatException($"TYPE is '{type}'; a tour file has TYPE TOUR.");
        }

        var tour = nodes ?? throw new FormatException("The file has no TOUR_SECTION.");
        var dimension = header.TryGetValue("DIMENSION", out var dimensionText) && int.TryParse(dimensionText, NumberStyles.Integer, CultureInfo.InvariantCulture, out var d)
            ? d
            : tour.Count;
        if (tour.Count != dimension || tour.Any(v => v < 0 || v >= dimension) || tour.Distinct().Count() != tour.Count)
        {
            throw new FormatException($"The tour must list each of the {dimension} nodes exactly once; it lists {tour.Count} entries.");
        }

        return new TsplibTour(name, tour);
    }

    private static string? SectionOf(string line)
    {
        var word = line.Split((char[]?)null, 2, StringSplitOptions.RemoveEmptyEntries)[0].TrimEnd(':');
        return Array.IndexOf(Sections, word) >= 0 ? word : null;
    }

    private static (string Key, string Value) KeyValue(string line, int lineNumber)
    {
        var colon = line.IndexOf(':', StringComparison.Ordinal);
        if (colon <= 0)
        {
            throw new FormatException($"Line {lineNumber}: expected 'KEY : value' or a section name; got '{Shorten(line)}'.");
        }

        return (line[..colon].Trim(), line[(colon + 1)..].Trim());
    }

    private static string Required(Dictionary<string, string> header, string key) =>
        header.TryGetValue(key, out var value) && value.Length > 0 ? value : throw new FormatException($"The file has no {key}.");

    private static (double X, double Y)[] ReadCoordinates(Reader reader, int n)
    {
        var coordinates = new (double X, double Y)[n];
        var seen = new bool[n];
        for (var k = 0; k < n; k++)
        {
            var line = reader.NextLine() ?? throw reader.Error($"The coordinate section ends after {k} of {n} nodes.");
            var parts = line.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries);
            if (parts.Length != 3
                || !int.TryParse(parts[0], NumberStyles.Integer, CultureInfo.InvariantCulture, out var id)
                || !double.TryParse(parts[1], NumberStyles.Float, CultureInfo.InvariantCulture, out var x)
                || !double.TryParse(parts[2], NumberStyles.Float, CultureInfo.InvariantCulture, out var y)
                || !double.IsFinite(x) || !double.IsFinite(y))
            {
                throw reader.Error($"Expected 'node x y'; got '{Shorten(line)}'.");
            }

            if (id < 1 || id > n || seen[id - 1])
            {
                throw reader.Error(id < 1 || id > n ? $"Node {id} is outside 1..{n}." : $"Node {id} has two coordinate lines.");
            }

            seen[id - 1] = true;
            coordinates[id - 1] = (x, y);
        }

        return coordinates;
    }

    private static long[] ReadNumbers(Reader reader, int count, string section)
    {
        var numbers = new long[count];
        var read = 0;
        while (read < count)
        {
            var line = reader.NextLine() ?? throw reader.Error($"{section} ends after {read} of {count} numbers.");
            foreach (var token in line.Split((char[]?)null, StringSplitOptions.RemoveEmptyEntries))
            {
                if (read == count)
                {
                    throw reader.Error($"{section} has more than the {count} numbers its format needs.");
                }

                numbers[read++] = long.TryParse(token, NumberStyles.Integer, CultureInfo.InvariantCulture, out var value) && value >= 0
                    ? value
                    : throw reader.Error($"'{Shorten(token)}' is not a non-negative whole-number weight.");
            }
        }

        return numbers;
    }

    private static int WeightCount(Dictionary<string, string> header, int n, Reader reader)
    {
        if (!header.TryGetValue("EDGE_WEIGHT_FORMAT", out var format))
        {
            throw reader.Error("EDGE_WEIGHT_SECTION comes before EDGE_WEIGHT_FORMAT.");
        }

        return format switch
        {
            "FULL_MATRIX" => n * n,
            "UPPER_ROW" or "LOWER_ROW" => n * (n - 1) / 2,
            "UPPER_DIAG_ROW" or "LOWER_DIAG_ROW" => n * (n + 1) / 2,
            _ => throw new NotSupportedException($"EDGE_WEIGHT_FORMAT '{format}' is not supported; FULL_MATRIX, UPPER_ROW, LOWER_ROW, UPPER_DIAG_ROW and LOWER_DIAG_ROW are."),
        };
    }

    private static long[][] Euclidean((double X, double Y)[] points)
    {
        var n = points.Length;
        var d = new long[n][];
        for (var i = 0; i < n; i++)
        {
            d[i] = new long[n];
            for (var j = 0; j < n; j++)
            {
                var dx = points[i].X - points[j].X;
                var dy = points[i].Y - points[j].Y;
                d[i][j] = (long)(Math.Sqrt((dx * dx) + (dy * dy)) + 0.5); // TSPLIB's nint.
            }
        }

        return d;
    }

    private static long[][] Explicit(int n, string format, long[] weights, string type)
    {
        var d = new long[n][];
        for (var i = 0; i < n; i++)
        {
            d[i] = new long[n];
        }

        if (format == "FULL_MATRIX")
        {
            for (var i = 0; i < n; i++)
            {
                Array.Copy(weights, i * n, d[i], 0, n);
            }

            return d;
        }

        if (type != "TSP")
        {
            throw new FormatException($"EDGE_WEIGHT_FORMAT {format} describes a symmetric matrix; TYPE {type} needs FULL_MATRIX.");
        }

        // Row by row through one triangle; the other triangle mirrors it.
        var k = 0;
        for (var i = 0; i < n; i++)
        {
            var (from, to) = format switch
            {
                "UPPER_ROW" => (i + 1, n),
                "UPPER_DIAG_ROW" => (i, n),
                "LOWER_ROW" => (0, i),
                _ => (0, i + 1), // LOWER_DIAG_ROW
            };
            for (var j = from; j < to; j++)
            {
                d[i][j] = weights[k];
                d[j][i] = weights[k];
                k++;
            }
        }

        return d;
    }

    private static string Shorten(string text) => text.Length <= 60 ? text : text[..60] + "…";

    private sealed class Reader(string text)
    {
        private readonly string[] _lines = text.Split('\n');
        private int _next;

        public int LineNumber => _next;

        /// <summary>The next non-blank line, trimmed, or null at the end.</summary>
        public string? NextLine()
        {
            while (_next < _lines.Length)
            {
                var line = _lines[_next++].Trim();
                if (line.Length > 0)
                {
                    return line;
                }
            }

            return null;
        }

        public FormatException Error(string message) => new($"Line {LineNumber}: {message}");
    }
}
