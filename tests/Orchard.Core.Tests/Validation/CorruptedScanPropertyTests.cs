using CsCheck;
using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Validation;

namespace Orchard.Core.Tests.Validation;

/// <summary>
/// Randomly corrupted valid scans: validation never throws, and every single corruption is caught as
/// at least one error. Stacked corruptions may cancel out, so for those only "never throws" holds.
/// </summary>
public sealed class CorruptedScanPropertyTests
{
    private static readonly TreeScan[] Valid = DemoOrchard.Generate(new DemoOrchardSettings(TreesPerRow: 2)).Trees.Select(t => t.Scan).ToArray();

    private const int Corruptions = 16;

    private static readonly double[] BadNumbers = [double.NaN, double.PositiveInfinity, double.NegativeInfinity, 1e308, -1e300];

    /// <summary>Applies corruption <paramref name="kind"/>, choosing its target from <paramref name="pick"/>.</summary>
    private static TreeScan Corrupt(TreeScan scan, int kind, int pick, double amount)
    {
        int Of(int count) => pick % count;
        var bad = BadNumbers[pick % BadNumbers.Length];
        return kind switch
        {
            0 => scan.WithNode(Of(scan.Nodes.Count), n => (pick % 3) switch { 0 => n with { XM = bad }, 1 => n with { YM = bad }, _ => n with { ZM = bad } }),
            1 => scan.WithNode(Of(scan.Nodes.Count - 1) + 1, n => n with { Id = scan.Nodes[0].Id }),
            2 => scan.WithBranch(Of(scan.Branches.Count), b => (pick % 2) == 0 ? b with { FromNode = "missing-" + pick } : b with { ToNode = "missing-" + pick }),
            3 => scan.WithBranch(Of(scan.Branches.Count), b => b with { FromRadiusM = -amount }),
            4 => scan.WithCut(Of(scan.Cuts.Count), c => c with { PositionAlong = (pick % 2) == 0 ? 1 + amount + 1e-9 : -amount - 1e-9 }),
            5 => scan.WithCut(Of(scan.Cuts.Count), c => c with { DiameterMm = -amount }),
            6 => scan with { Nodes = scan.Nodes.Where((_, i) => i != Of(scan.Nodes.Count)).ToArray() },
            7 => AddBackEdge(scan, pick),
            8 => scan.WithCut(Of(scan.Cuts.Count), c => c with { BranchId = "nowhere" }),
            9 => scan.WithCut(Of(scan.Cuts.Count - 1) + 1, c => c with { Id = scan.Cuts[0].Id }),
            10 => scan.WithBranch(Of(scan.Branches.Count), b => b with { ToNode = b.FromNode }),
            11 => (pick % 4) switch { 0 => scan with { Nodes = null! }, 1 => scan with { Branches = null! }, 2 => scan with { Cuts = null! }, _ => scan with { ArmBase = null! } },
            12 => scan.WithBranch(Of(scan.Branches.Count), b => b with { Id = null! }),
            13 => scan with { TreeId = (pick % 2) == 0 ? string.Empty : "tab\there" },
            14 => scan.WithObstacle(Of(scan.Obstacles.Count), o => o with { RadiusM = bad }),
            _ => scan with { Branches = scan.Branches.Where((_, i) => i != Of(scan.Branches.Count)).ToArray() },
        };
    }

    /// <summary>A branch from a node back to one of the leader's lower nodes: that node gets a second parent.</summary>
    private static TreeScan AddBackEdge(TreeScan scan, int pick)
    {
        var from = scan.Nodes[pick % scan.Nodes.Count].Id;
        var to = scan.Branches[pick % scan.Branches.Count].ToNode;
        return scan with { Branches = [.. scan.Branches, new Branch("extra", from, to, 0.004, 0.004)] };
    }

    /// <summary>A corruption may need a list an earlier one removed; then it leaves the scan as it is.</summary>
    private static TreeScan CorruptIfPossible(TreeScan scan, int kind, int pick, double amount)
    {
        try
        {
            return Corrupt(scan, kind, pick, amount);
        }
        catch (Exception ex) when (ex is NullReferenceException or ArgumentNullException or DivideByZeroException or IndexOutOfRangeException)
        {
            return scan;
        }
    }

    private static readonly Gen<(int Tree, int Kind, int Pick, double Amount)> OneCorruption =
        Gen.Select(Gen.Int[0, Valid.Length - 1], Gen.Int[0, Corruptions - 1], Gen.Int[0, 1_000_000], Gen.Double[0, 5]);

    [Fact]
    public void Every_single_corruption_is_caught_and_never_crashes()
    {
        OneCorruption.Sample(c =>
        {
            var scan = Corrupt(Valid[c.Tree], c.Kind, c.Pick, c.Amount);
            var report = TreeScanValidator.Validate(scan, shearRatingMm: 20);
            Assert.False(report.IsValid, $"corruption {c.Kind} (pick {c.Pick}) was not caught");
        }, iter: 4000);
    }

    [Fact]
    public void Stacked_corruptions_never_crash_validation()
    {
        OneCorruption.Array[1, 5].Select(Gen.Int[0, Valid.Length - 1]).Sample(t =>
        {
            var scan = t.Item1.Aggregate(Valid[t.Item2], (s, c) => CorruptIfPossible(s, c.Kind, c.Pick, c.Amount));
            var report = TreeScanValidator.Validate(scan, shearRatingMm: 20);
            Assert.All(report.Problems, p => Assert.StartsWith("$", p.Path, StringComparison.Ordinal));
        }, iter: 2000);
    }

    [Fact]
    public void Every_demo_scan_used_here_starts_valid()
    {
        Assert.All(Valid, s => Assert.True(TreeScanValidator.Validate(s).IsValid));
    }
}
