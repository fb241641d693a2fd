using Orchard.Core.Sequencing.Tsplib;

namespace Orchard.Core.Tests.Sequencing;

/// <summary>The TSPLIB reader, on the library's own files (tests/data/tsplib in the repository) and on small texts.</summary>
public sealed class TsplibParserTests
{
    /// <summary>Node counts from the table in tests/data/tsplib/README.md (TSPLIB, Reinelt 1991).</summary>
    public static TheoryData<string, int, string> Instances => new()
    {
        { "eil51", 51, "TSP" }, { "berlin52", 52, "TSP" }, { "st70", 70, "TSP" }, { "eil76", 76, "TSP" },
        { "pr76", 76, "TSP" }, { "rat99", 99, "TSP" }, { "kroA100", 100, "TSP" }, { "ch130", 130, "TSP" },
        { "br17", 17, "ATSP" }, { "ftv33", 34, "ATSP" }, { "ft53", 53, "ATSP" }, { "ftv70", 71, "ATSP" },
    };

    [Theory]
    [MemberData(nameof(Instances))]
    public void Every_instance_parses_with_the_size_and_type_the_README_gives(string name, int nodes, string type)
    {
        var instance = RepositoryTsplib.Instance(name);
        Assert.Equal(nodes, instance.Dimension);
        Assert.Equal(type, instance.Type);
        Assert.Equal(name, instance.Name);
    }

    [Fact]
    public void The_folder_holds_exactly_the_instances_listed_in_optima_csv()
    {
        // Every .tsp/.atsp there must be one this reader was checked on.
        var files = Directory.EnumerateFiles(RepositoryTsplib.Directory)
            .Where(f => f.EndsWith(".tsp", StringComparison.Ordinal) || f.EndsWith(".atsp", StringComparison.Ordinal))
            .Select(Path.GetFileNameWithoutExtension)
            .Order(StringComparer.Ordinal);
        Assert.Equal(RepositoryTsplib.Optima().Keys.Order(StringComparer.Ordinal), files);
    }

    /// <summary>
    /// The README in tests/data/tsplib says each .opt.tour, measured with TSPLIB's rounding, has exactly
    /// the optimum in optima.csv (TSPLIB's published optima).
    /// </summary>
    [Fact]
    public void Every_optimal_tour_file_measures_exactly_the_published_optimum()
    {
        var optima = RepositoryTsplib.Optima();
        var tours = Directory.EnumerateFiles(RepositoryTsplib.Directory, "*.opt.tour").Order(StringComparer.Ordinal).ToList();
        Assert.NotEmpty(tours);
        foreach (var path in tours)
        {
            var name = Path.GetFileName(path)[..^".opt.tour".Length];
            var tour = TsplibParser.ParseTour(File.ReadAllText(path));
            var instance = RepositoryTsplib.Instance(name);
            Assert.Equal(instance.Dimension, tour.Nodes.Count);
            Assert.True(optima[name] == instance.ClosedTourLength(tour.Nodes), $"{name}: optimal tour measures {instance.ClosedTourLength(tour.Nodes)}, optima.csv says {optima[name]}");
        }
    }

    [Fact]
    public void Euclidean_distances_are_rounded_to_the_nearest_integer_as_TSPLIB_defines()
    {
        // berlin52.tsp: node 1 at (565, 575), node 2 at (25, 185): √(540² + 390²) = 666.108 → 666.
        var berlin = RepositoryTsplib.Instance("berlin52");
        Assert.Equal((565.0, 575.0), berlin.Coordinates![0]);
        Assert.Equal(666, berlin.Distance(0, 1));

        // (0,0)–(1,1): √2 = 1.414 → 1; (0,0)–(3,4) = 5; (0,0)–(1,2): √5 = 2.236 → 2; (0,0)-(2,3): √13 = 3.606 → 4.
        var small = TsplibParser.Parse("NAME: t\nTYPE: TSP\nDIMENSION: 5\nEDGE_WEIGHT_TYPE: EUC_2D\nNODE_COORD_SECTION\n1 0 0\n2 1 1\n3 3 4\n4 1 2\n5 2.0e0 3\nEOF\n");
        Assert.Equal([1L, 5, 2, 4], Enumerable.Range(1, 4).Select(j => small.Distance(0, j)));
    }

    [Fact]
    public void Full_matrices_keep_their_asymmetry_as_in_br17()
    {
        // br17.atsp, first row: 9999 3 5 48 48 8 …; second row starts 3 9999 3.
        var br17 = RepositoryTsplib.Instance("br17");
        Assert.Equal(3, br17.Distance(0, 1));
        Assert.Equal(5, br17.Distance(0, 2));
        Assert.Equal(48, br17.Distance(0, 3));
        Assert.Equal(3, br17.Distance(1, 2));
        Assert.False(br17.IsSymmetric);
    }

    [Fact]
    public void The_explicit_triangle_formats_give_the_same_matrix_as_the_full_one()
    {
        // Symmetric 4×4: d01=1, d02=2, d03=3, d12=4, d13=5, d23=6.
        var expected = TsplibParser.Parse(Explicit("FULL_MATRIX", "0 1 2 3\n1 0 4 5\n2 4 0 6\n3 5 6 0"));
        string[][] formats =
        [
            ["UPPER_ROW", "1 2 3\n4 5\n6"],
            ["LOWER_ROW", "1\n2 4\n3 5 6"],
            ["UPPER_DIAG_ROW", "0 1 2 3 0 4 5 0 6 0"],
            ["LOWER_DIAG_ROW", "0\n1 0\n2 4 0\n3 5 6 0"],
        ];
        foreach (var format in formats)
        {
            var parsed = TsplibParser.Parse(Explicit(format[0], format[1]));
            for (var i = 0; i < 4; i++)
            {
                for (var j = 0; j < 4; j++)
                {
                    Assert.True(expected.Distance(i, j) == parsed.Distance(i, j), $"{format[0]}: d({i},{j}) = {parsed.Distance(i, j)}, full matrix says {expected.Distance(i, j)}");
                }
            }
        }
    }

    [Fact]
    public void Malformed_and_unsupported_files_are_refused_with_the_reason()
    {
        Assert.Contains("no DIMENSION", Assert.Throws<FormatException>(() => TsplibParser.Parse("NAME: x\nTYPE: TSP\nEDGE_WEIGHT_TYPE: EUC_2D\n")).Message, StringComparison.Ordinal);
        Assert.Contains("Line 6", Assert.Throws<FormatException>(() => TsplibParser.Parse("NAME: x\nTYPE: TSP\nDIMENSION: 2\nEDGE_WEIGHT_TYPE: EUC_2D\nNODE_COORD_SECTION\n1 0 zero\n2 1 1\n")).Message, StringComparison.Ordinal);
        Assert.Contains("ends after 3 of 4", Assert.Throws<FormatException>(() => TsplibParser.Parse("NAME: x\nTYPE: ATSP\nDIMENSION: 2\nEDGE_WEIGHT_TYPE: EXPLICIT\nEDGE_WEIGHT_FORMAT: FULL_MATRIX\nEDGE_WEIGHT_SECTION\n0 1 2\n")).Message, StringComparison.Ordinal);
        Assert.Contains("GEO", Assert.Throws<NotSupportedException>(() => TsplibParser.Parse("NAME: x\nTYPE: TSP\nDIMENSION: 2\nEDGE_WEIGHT_TYPE: GEO\nNODE_COORD_SECTION\n1 0 0\n2 1 1\n")).Message, StringComparison.Ordinal);
        Assert.Contains("CVRP", Assert.Throws<NotSupportedException>(() => TsplibParser.Parse("NAME: x\nTYPE: CVRP\nDIMENSION: 2\nEDGE_WEIGHT_TYPE: EUC_2D\nNODE_COORD_SECTION\n1 0 0\n2 1 1\n")).Message, StringComparison.Ordinal);
        Assert.Contains("needs FULL_MATRIX", Assert.Throws<FormatException>(() => TsplibParser.Parse(Explicit("UPPER_ROW", "1 2 3 4 5 6").Replace("TYPE: TSP", "TYPE: ATSP", StringComparison.Ordinal))).Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Tour_files_must_list_every_node_once_and_end_with_minus_one()
    {
        var tour = TsplibParser.ParseTour("NAME : t.opt.tour\nTYPE : TOUR\nDIMENSION : 3\nTOUR_SECTION\n1\n3\n2\n-1\nEOF\n");
        Assert.Equal([0, 2, 1], tour.Nodes);
        Assert.Throws<FormatException>(() => TsplibParser.ParseTour("NAME : t\nTYPE : TOUR\nDIMENSION : 3\nTOUR_SECTION\n1\n3\n3\n-1\n"));
        Assert.Throws<FormatException>(() => TsplibParser.ParseTour("NAME : t\nTYPE : TOUR\nDIMENSION : 3\nTOUR_SECTION\n1\n3\n2\n"));
        Assert.Throws<FormatException>(() => TsplibParser.ParseTour("NAME : t\nTYPE : TOUR\nDIMENSION : 3\nTOUR_SECTION\n1\n2\n-1\n"));
    }

    private static string Explicit(string format, string weights) =>
        $"NAME: m\nTYPE: TSP\nDIMENSION: 4\nEDGE_WEIGHT_TYPE: EXPLICIT\nEDGE_WEIGHT_FORMAT: {format}\nEDGE_WEIGHT_SECTION\n{weights}\nEOF\n";
}
