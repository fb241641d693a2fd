namespace Orchard.Core.Collision;

/// <summary>Configurations along a joint path, spaced so that no arm point moves more than a given distance between two.</summary>
public static class PathSampling
{
    public static IEnumerable<double[]> Samples(IReadOnlyList<double[]> path, ArmCollisionModel arm, double maxPointStepM)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(arm);
        if (path.Count == 0)
        {
            yield break;
        }

        yield return path[0];
        var n = arm.JointCount;
        var delta = new double[n];
        for (var s = 0; s + 1 < path.Count; s++)
        {
            var a = path[s];
            var b = path[s + 1];
            for (var j = 0; j < n; j++)
            {
                delta[j] = Math.Abs(b[j] - a[j]);
            }

            var bound = 0.0;
            for (var k = 0; k <= arm.ToolLink; k++)
            {
                bound = Math.Max(bound, arm.MotionBoundM(delta, k));
            }

            var steps = Math.Max(1, (int)Math.Ceiling(bound / maxPointStepM));
            for (var i = 1; i <= steps; i++)
            {
                // The segment's last sample is its end waypoint itself: a + (b − a)·1 can miss b by an ulp, which
                // puts a waypoint sitting on a joint limit (stow's lift at 0 m) a rounding error outside it.
                if (i == steps)
                {
                    yield return b.ToArray();
                    continue;
                }

                var t = (double)i / steps;
                var q = new double[n];
                for (var j = 0; j < n; j++)
                {
                    q[j] = a[j] + ((b[j] - a[j]) * t);
                }

                yield return q;
            }
        }
    }
}
