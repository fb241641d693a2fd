using CsCheck;
using Orchard.Core.Demo;
using Orchard.Core.Timing;

namespace Orchard.Core.Tests.Timing;

public sealed class TimeParameterizerPropertyTests
{
    private const double Tolerance = 1e-9;

    private static readonly Gen<(double[][] Path, double[] Vmax, double[] Amax)> RandomPath =
        from joints in Gen.Int[1, 7]
        from count in Gen.Int[2, 6]
        from path in Gen.Double[-3, 3].Array[joints].Array[count]
        from vmax in Gen.Double[0.1, 6].Array[joints]
        from amax in Gen.Double[0.2, 12].Array[joints]
        select (path, vmax, amax);

    [Fact]
    public void Sampled_finely_no_joint_exceeds_its_limits_and_every_waypoint_is_passed()
    {
        RandomPath.Sample(c =>
        {
            var limits = new JointSpeedLimits(c.Vmax, c.Amax);
            var trajectory = TimeParameterizer.Parameterize(c.Path, limits);
            var n = c.Vmax.Length;
            Span<double> q = stackalloc double[n], qd = stackalloc double[n], qdd = stackalloc double[n];
            Span<double> qNext = stackalloc double[n], unused = stackalloc double[n], unused2 = stackalloc double[n];

            // Start and end at rest, on the first and last waypoints.
            trajectory.Sample(0, q, qd, qdd);
            AssertAt(c.Path[0], q, qd);
            trajectory.Sample(trajectory.DurationS, q, qd, qdd);
            AssertAt(c.Path[^1], q, qd);

            // Every waypoint passed exactly, at rest.
            for (var w = 0; w < c.Path.Length; w++)
            {
                trajectory.Sample(trajectory.WaypointTimeS(w), q, qd, qdd);
                AssertAt(c.Path[w], q, qd);
            }

            // Fine sampling: reported rates within limits, and the positions really move at those rates.
            const int steps = 1500;
            if (trajectory.DurationS == 0)
            {
                return;
            }

            var dt = trajectory.DurationS / steps;
            for (var k = 0; k < steps; k++)
            {
                var t = k * dt;
                trajectory.Sample(t, q, qd, qdd);
                trajectory.Sample(t + dt, qNext, unused, unused2);
                for (var j = 0; j < n; j++)
                {
                    Assert.True(Math.Abs(qd[j]) <= c.Vmax[j] + Tolerance, $"velocity {qd[j]} > {c.Vmax[j]}");
                    Assert.True(Math.Abs(qdd[j]) <= c.Amax[j] + Tolerance, $"acceleration {qdd[j]} > {c.Amax[j]}");
                    var finiteDifference = (qNext[j] - q[j]) / dt;
                    Assert.True(Math.Abs(finiteDifference) <= c.Vmax[j] * (1 + 1e-6) + Tolerance, $"moved at {finiteDifference} > {c.Vmax[j]}");
                }
            }
        }, iter: 200);
    }

    private static void AssertAt(double[] expected, ReadOnlySpan<double> q, ReadOnlySpan<double> qd)
    {
        for (var j = 0; j < expected.Length; j++)
        {
            Assert.Equal(expected[j], q[j], 12);
            Assert.Equal(0, qd[j], 12);
        }
    }

    [Fact]
    public void Knots_reproduce_the_trajectory_between_them()
    {
        var limits = JointSpeedLimits.From(DemoArm.Create());
        double[][] path = [[0, 0, 0, 0, 0, 0, 0], [0.5, 1, -0.5, 0.3, 0.2, -0.1, 0], [0.5, 1.1, -0.4, 0.3, 0.2, -0.1, 0.05]];
        var trajectory = TimeParameterizer.Parameterize(path, limits);
        var knots = trajectory.Knots();
        Assert.Equal(0, knots[0].TimeS);
        Assert.Equal(trajectory.DurationS, knots[^1].TimeS, 12);
        Span<double> q = stackalloc double[7], qd = stackalloc double[7], qdd = stackalloc double[7];
        for (var k = 0; k + 1 < knots.Count; k++)
        {
            var (a, b) = (knots[k], knots[k + 1]);
            var mid = (a.TimeS + b.TimeS) / 2;
            trajectory.Sample(mid, q, qd, qdd);
            for (var j = 0; j < 7; j++)
            {
                // Constant acceleration between knots: the midpoint position is the mean of the ends plus (va − vb)·Δt/8.
                var expected = ((a.Positions[j] + b.Positions[j]) / 2) + ((a.Velocities[j] - b.Velocities[j]) * (b.TimeS - a.TimeS) / 8);
                Assert.Equal(expected, q[j], 9);
            }
        }
    }

    [Fact]
    public void The_straight_line_time_is_the_single_segment_duration_and_grows_with_distance()
    {
        var limits = JointSpeedLimits.From(DemoArm.Create());
        double[] a = [0, 0, 0, 0, 0, 0, 0];
        double[] b = [0.2, 0.5, 0, 0, 0, 0, 0];
        double[] c = [0.4, 1.0, 0, 0, 0, 0, 0];
        var ab = TimeParameterizer.StraightLineSeconds(a, b, limits);
        Assert.Equal(TimeParameterizer.Parameterize([a, b], limits).DurationS, ab, 12);
        Assert.True(TimeParameterizer.StraightLineSeconds(a, c, limits) > ab);
        Assert.Equal(0, TimeParameterizer.StraightLineSeconds(a, a, limits));
    }
}
