using Orchard.Core.Timing;

namespace Orchard.Core.Tests.Timing;

/// <summary>
/// Against the rest-to-rest trapezoidal-velocity formulas of Biagiotti and Melchiorri, "Trajectory
/// Planning for Automatic Machines and Robots" (Springer, 2008), §3.2.2, also Siciliano et al.,
/// "Robotics: Modelling, Planning and Control" (Springer, 2009), §4.2.1: T = h/v + v/a when h ≥ v²/a,
/// else T = 2√(h/a) with peak √(a·h). The numbers below are worked by hand from those formulas.
/// </summary>
public sealed class TrapezoidalProfileTests
{
    [Fact]
    public void A_long_move_cruises_trapezoidal_case()
    {
        // h = 10, v = 2, a = 1: Ta = v/a = 2 s, T = 10/2 + 2/1 = 7 s, cruise 3 s.
        var p = new TrapezoidalProfile(10, 2, 1);
        Assert.False(p.IsTriangular);
        Assert.Equal(7.0, p.TotalSeconds, 12);
        Assert.Equal(2.0, p.AccelerationSeconds, 12);
        Assert.Equal(3.0, p.CruiseSeconds, 12);
        Assert.Equal(2.0, p.PeakVelocity, 12);

        // Accelerating phase covers ½·a·Ta² = 2; at mid-cruise t = 3.5 the distance is 2 + 2·1.5 = 5 (half way).
        Assert.Equal(2.0, p.Position(2.0), 12);
        Assert.Equal(5.0, p.Position(3.5), 12);
        Assert.Equal(10.0, p.Position(7.0), 12);
    }

    [Fact]
    public void A_short_move_never_reaches_top_speed_triangular_case()
    {
        // h = 1, v = 2, a = 1: h < v²/a = 4, so T = 2√(1/1) = 2 s with peak √(1·1) = 1.
        var p = new TrapezoidalProfile(1, 2, 1);
        Assert.True(p.IsTriangular);
        Assert.Equal(2.0, p.TotalSeconds, 12);
        Assert.Equal(1.0, p.PeakVelocity, 12);
        Assert.Equal(0.5, p.Position(1.0), 12);
    }

    [Theory]
    [InlineData(0.3, 1.2, 4.0)]
    [InlineData(2.0, 0.5, 0.7)]
    [InlineData(0.01, 3.0, 10.0)]
    public void Formulas_hold_for_both_cases_and_meet_at_the_boundary(double h, double v, double a)
    {
        var p = new TrapezoidalProfile(h, v, a);
        var expected = h >= v * v / a ? (h / v) + (v / a) : 2 * Math.Sqrt(h / a);
        Assert.Equal(expected, p.TotalSeconds, 12);

        // At h = v²/a both forms give 2v/a.
        var boundary = new TrapezoidalProfile(v * v / a, v, a);
        Assert.Equal(2 * v / a, boundary.TotalSeconds, 10);
    }

    [Fact]
    public void Zero_distance_takes_no_time()
    {
        var p = new TrapezoidalProfile(0, 1, 1);
        Assert.Equal(0, p.TotalSeconds);
        Assert.Equal(0, p.Position(1));
    }
}
