namespace Orchard.Core.Timing;

/// <summary>
/// The one interpolation every trajectory the service emits follows (travel, approach, retract, retreat,
/// return to stow), so a controller can reproduce the motion exactly from the knots.
/// <para>
/// Knots k = 0..n−1 carry a time t_k (seconds from the trajectory's start, increasing), joint positions
/// q_k and joint velocities v_k. Between knots k and k+1, with h = t_{k+1} − t_k and τ = t − t_k, every joint
/// moves with constant acceleration a_k = (v_{k+1} − v_k) / h:
/// q(t) = q_k + v_k·τ + ½·a_k·τ², q̇(t) = v_k + a_k·τ, q̈(t) = a_k.
/// The knots are consistent with it: q_{k+1} = q_k + ½·(v_k + v_{k+1})·h (to rounding, 1e-9 at most), so
/// positions and velocities are continuous at every knot; accelerations jump only at knots. Before the
/// first knot and after the last the arm is at rest there.
/// </para>
/// </summary>
public static class KnotContract
{
    /// <summary>The reference sampler: position, velocity and acceleration at time t (clamped to the trajectory).</summary>
    public static void Sample(IReadOnlyList<TrajectoryPoint> knots, double t, Span<double> position, Span<double> velocity, Span<double> acceleration)
    {
        ArgumentNullException.ThrowIfNull(knots);
        if (knots.Count == 0)
        {
            throw new ArgumentException("A trajectory needs at least one knot.", nameof(knots));
        }

        var n = knots[0].Positions.Count;
        if (knots.Count == 1 || t <= knots[0].TimeS || t >= knots[^1].TimeS)
        {
            var at = knots.Count == 1 || t <= knots[0].TimeS ? knots[0] : knots[^1];
            for (var j = 0; j < n; j++)
            {
                position[j] = at.Positions[j];
                velocity[j] = 0;
                acceleration[j] = 0;
            }

            // Exactly at a knot inside the trajectory the velocity is the knot's; outside it the arm rests.
            if (knots.Count > 1 && (t == knots[0].TimeS || t == knots[^1].TimeS))
            {
                for (var j = 0; j < n; j++)
                {
                    velocity[j] = at.Velocities[j];
                }
            }

            return;
        }

        var k = IntervalAt(knots, t);
        var (a, b) = (knots[k], knots[k + 1]);
        var h = b.TimeS - a.TimeS;
        var tau = t - a.TimeS;
        for (var j = 0; j < n; j++)
        {
            var acc = h > 0 ? (b.Velocities[j] - a.Velocities[j]) / h : 0;
            position[j] = a.Positions[j] + (a.Velocities[j] * tau) + (0.5 * acc * tau * tau);
            velocity[j] = a.Velocities[j] + (acc * tau);
            acceleration[j] = acc;
        }
    }

    /// <summary>The largest |q_{k+1} − q_k − ½(v_k + v_{k+1})h| over all knots and joints: how far the knots stray from the contract.</summary>
    public static double LargestResidual(IReadOnlyList<TrajectoryPoint> knots)
    {
        ArgumentNullException.ThrowIfNull(knots);
        var worst = 0.0;
        for (var k = 0; k + 1 < knots.Count; k++)
        {
            var (a, b) = (knots[k], knots[k + 1]);
            var h = b.TimeS - a.TimeS;
            for (var j = 0; j < a.Positions.Count; j++)
            {
                worst = Math.Max(worst, Math.Abs(b.Positions[j] - a.Positions[j] - (0.5 * (a.Velocities[j] + b.Velocities[j]) * h)));
            }
        }

        return worst;
    }

    /// <summary>The same motion run backwards in time (a retract from its approach): times mirrored, velocities negated.</summary>
    public static IReadOnlyList<TrajectoryPoint> Reversed(IReadOnlyList<TrajectoryPoint> knots)
    {
        ArgumentNullException.ThrowIfNull(knots);
        if (knots.Count == 0)
        {
            return [];
        }

        var end = knots[^1].TimeS;
        return knots.Reverse().Select(k => new TrajectoryPoint(end - k.TimeS, k.Positions.ToArray(), k.Velocities.Select(v => v == 0 ? 0 : -v).ToArray())).ToArray();
    }

    /// <summary>Index k of the interval [t_k, t_{k+1}] holding t (binary search).</summary>
    public static int IntervalAt(IReadOnlyList<TrajectoryPoint> knots, double t)
    {
        ArgumentNullException.ThrowIfNull(knots);
        int low = 0, high = knots.Count - 2;
        while (low < high)
        {
            var mid = (low + high + 1) / 2;
            if (knots[mid].TimeS <= t)
            {
                low = mid;
            }
            else
            {
                high = mid - 1;
            }
        }

        return Math.Max(0, low);
    }
}
