namespace Orchard.Core.Timing;

/// <summary>
/// Times a joint-space polyline without stopping at its corners: linear segments joined by parabolic blends,
/// the whole run at rest at both ends, every joint within its velocity and acceleration limits throughout,
/// knots following <see cref="KnotContract"/>.
/// <para>
/// The method is the textbook "linear segments with parabolic blends" through via points (Craig,
/// Introduction to Robotics, 3rd ed., 2005, §7.3; Biagiotti and Melchiorri, Trajectory Planning for
/// Automatic Machines and Robots, 2008, §3.2 and §4.2), in the multi-joint, path-synchronised form: on
/// segment i the configuration moves along the unit direction u_i at path speed ṡ; a corner c is rounded by
/// a parabola that leaves segment c−1 at distance ℓ_c before the corner and joins segment c at ℓ_c after it,
/// at one path speed z_c, with constant joint acceleration z_c²(u_c − u_{c−1})/(2ℓ_c) for 2ℓ_c/z_c seconds.
/// So the blend's joint velocities move linearly between z_c·u_{c−1} and z_c·u_c (within the limits when both
/// ends are), and z_c is capped so every joint's blend acceleration is within its limit. The corner speeds
/// then pass the usual backward and forward sweeps (each segment's accelerating and braking within its
/// path-acceleration limit), and each linear part becomes accelerate, cruise, brake.
/// </para>
/// <para>
/// A blend leaves the polyline (within the triangle of its corner); callers must check it, e.g. by
/// <c>TrajectoryCheck</c>, and give a corner a smaller blend or none (a stop) when it is not free. With every
/// blend scale 0 the result is the rest-to-rest timing of <see cref="TimeParameterizer"/>.
/// </para>
/// </summary>
public static class PathTiming
{
    private const double Tiny = 1e-12;

    public static TimedPath Time(IReadOnlyList<double[]> waypoints, JointSpeedLimits limits, PathTimingOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(waypoints);
        ArgumentNullException.ThrowIfNull(limits);
        options ??= PathTimingOptions.Default;
        if (waypoints.Count == 0)
        {
            throw new ArgumentException("A path needs at least one waypoint.", nameof(waypoints));
        }

        var n = limits.JointCount;
        if (waypoints.Any(w => w.Length != n))
        {
            throw new ArgumentException("Every waypoint needs one value per joint.", nameof(waypoints));
        }

        // Segments, dropping ones of no length (their caps and scales with them).
        var points = new List<double[]> { waypoints[0] };
        var keptSegment = new List<int>();
        for (var i = 1; i < waypoints.Count; i++)
        {
            if (Distance(points[^1], waypoints[i]) > Tiny)
            {
                points.Add(waypoints[i]);
                keptSegment.Add(i - 1);
            }
        }

        if (points.Count == 1)
        {
            return new TimedPath([new TrajectoryPoint(0, points[0].ToArray(), new double[n])], [], []);
        }

        var m = points.Count - 1;
        var length = new double[m];
        var unit = new double[m][];
        var speedCap = new double[m];
        var accelCap = new double[m];
        for (var i = 0; i < m; i++)
        {
            length[i] = Distance(points[i], points[i + 1]);
            unit[i] = new double[n];
            speedCap[i] = options.SegmentSpeedCaps is { } sc ? sc[keptSegment[i]] : double.PositiveInfinity;
            accelCap[i] = options.SegmentAccelerationCaps is { } ac ? ac[keptSegment[i]] : double.PositiveInfinity;
            for (var j = 0; j < n; j++)
            {
                unit[i][j] = (points[i + 1][j] - points[i][j]) / length[i];
                var u = Math.Abs(unit[i][j]);
                if (u > Tiny)
                {
                    speedCap[i] = Math.Min(speedCap[i], limits.MaxVelocity[j] / u);
                    accelCap[i] = Math.Min(accelCap[i], limits.MaxAcceleration[j] / u);
                }
            }
        }

        // Corners 1..m−1 (at points[c]): blend half-length and the speed it allows.
        var blend = new double[m + 1];
        var z = new double[m + 1];
        for (var c = 1; c < m; c++)
        {
            var scale = options.CornerBlendScales is { } scales ? CornerScale(scales, keptSegment, c) : 1.0;
            var collinear = true;
            for (var j = 0; j < n && collinear; j++)
            {
                collinear = Math.Abs(unit[c][j] - unit[c - 1][j]) <= 1e-12;
            }

            if (collinear)
            {
                z[c] = scale > 0 ? Math.Min(speedCap[c - 1], speedCap[c]) : 0;
                continue;
            }

            blend[c] = scale * Math.Min(options.BlendFraction * 0.5 * Math.Min(length[c - 1], length[c]), options.MaxBlendLength);
            if (blend[c] <= Tiny)
            {
                blend[c] = 0;
                continue; // A stop at this corner.
            }

            var cap = Math.Min(speedCap[c - 1], speedCap[c]);
            for (var j = 0; j < n; j++)
            {
                var du = Math.Abs(unit[c][j] - unit[c - 1][j]);
                if (du > Tiny)
                {
                    cap = Math.Min(cap, Math.Sqrt(2 * blend[c] * limits.MaxAcceleration[j] / du));
                }
            }

            z[c] = cap;
        }

        // Linear parts between blends, and the sweeps that keep each within its acceleration limit.
        var linear = new double[m];
        for (var i = 0; i < m; i++)
        {
            linear[i] = Math.Max(0, length[i] - blend[i] - blend[i + 1]);
        }

        for (var i = m - 1; i >= 0; i--)
        {
            z[i] = Math.Min(z[i], Math.Sqrt((z[i + 1] * z[i + 1]) + (2 * accelCap[i] * linear[i])));
        }

        for (var i = 0; i < m; i++)
        {
            z[i + 1] = Math.Min(z[i + 1], Math.Sqrt((z[i] * z[i]) + (2 * accelCap[i] * linear[i])));
        }

        // Knots, in time order.
        var knots = new List<TrajectoryPoint> { new(0, points[0].ToArray(), new double[n]) };
        var intervalSegment = new List<int>();
        var intervalCorner = new List<int>();
        var t = 0.0;
        void Add(double seconds, double[] position, double[] velocity, int segment, int corner)
        {
            if (seconds <= 1e-15)
            {
                return;
            }

            t += seconds;
            knots.Add(new TrajectoryPoint(t, position, velocity));
            intervalSegment.Add(keptSegment[segment]);
            intervalCorner.Add(corner);
        }

        double[] At(int i, double s) => points[i].Select((p, j) => p + (s * unit[i][j])).ToArray();
        double[] Velocity(int i, double speed) => unit[i].Select(u => speed * u).ToArray();
        for (var i = 0; i < m; i++)
        {
            var (za, zb, a, v) = (z[i], z[i + 1], accelCap[i], speedCap[i]);
            var start = blend[i];
            if (linear[i] > Tiny)
            {
                var peak = Math.Max(Math.Max(za, zb), Math.Min(v, Math.Sqrt((a * linear[i]) + (0.5 * ((za * za) + (zb * zb))))));
                var t1 = (peak - za) / a;
                var s1 = 0.5 * (za + peak) * t1;
                var t3 = (peak - zb) / a;
                var s3 = 0.5 * (peak + zb) * t3;
                var s2 = Math.Max(0, linear[i] - s1 - s3);
                Add(t1, At(i, start + s1), Velocity(i, peak), i, -1);
                Add(peak > 0 ? s2 / peak : 0, At(i, start + s1 + s2), Velocity(i, peak), i, -1);
                Add(t3, i + 1 < m || blend[i + 1] > 0 ? At(i, start + linear[i]) : points[i + 1].ToArray(), Velocity(i, zb), i, -1);
            }

            // The blend at the corner ending this segment.
            if (i + 1 < m && blend[i + 1] > 0 && z[i + 1] > 0)
            {
                var c = i + 1;
                Add(2 * blend[c] / z[c], At(c, blend[c]), Velocity(c, z[c]), c, keptSegment[c]);
            }
        }

        // The last knot exactly at the last waypoint, at rest.
        knots[^1] = new TrajectoryPoint(knots[^1].TimeS, points[^1].ToArray(), new double[n]);
        return new TimedPath(knots, intervalSegment, intervalCorner);
    }

    /// <summary>The scale given for the corner between kept segments c−1 and c (the waypoint they share).</summary>
    private static double CornerScale(IReadOnlyList<double> scales, List<int> keptSegment, int c)
    {
        var waypoint = keptSegment[c];
        return waypoint < scales.Count ? scales[waypoint] : 1.0;
    }

    private static double Distance(double[] a, double[] b)
    {
        var sum = 0.0;
        for (var j = 0; j < a.Length; j++)
        {
            sum += (b[j] - a[j]) * (b[j] - a[j]);
        }

        return Math.Sqrt(sum);
    }
}
