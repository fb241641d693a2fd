using Orchard.Core.Randomness;

namespace Orchard.Core.Planning;

/// <summary>
/// Shortens a joint path by replacing detours with straight segments that are free: first a greedy
/// pass (from each kept waypoint, jump to the farthest waypoint it sees), then random shortcuts between
/// points anywhere on the path (a common post-processing of sampled paths, e.g. Geraerts and Overmars,
/// "Creating High-quality Paths for Motion Planning", IJRR 26(8), 2007; recalled from memory). Every
/// new segment is checked with the same edge check as the planners, so the result is as safe.
/// </summary>
public static class PathShortcutter
{
    public static List<double[]> Shorten(IReadOnlyList<double[]> path, IMotionValidator validator, ShortcutSettings settings, DeterministicRandom random, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(path);
        ArgumentNullException.ThrowIfNull(validator);
        ArgumentNullException.ThrowIfNull(settings);
        ArgumentNullException.ThrowIfNull(random);
        var space = validator.Space;
        var points = path.ToList();
        if (points.Count <= 2)
        {
            return points;
        }

        // Greedy: from each kept waypoint, the farthest one reachable in a straight line.
        var greedy = new List<double[]> { points[0] };
        var at = 0;
        while (at < points.Count - 1)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var next = at + 1;
            for (var far = points.Count - 1; far > at + 1; far--)
            {
                if (validator.IsMotionFree(points[at], points[far]))
                {
                    next = far;
                    break;
                }
            }

            greedy.Add(points[next]);
            at = next;
        }

        points = greedy;

        // Random: join two points on different segments when the straight line between them is free.
        for (var attempt = 0; attempt < settings.RandomAttempts && points.Count > 2; attempt++)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var total = PathLength(space, points);
            if (total <= 0)
            {
                break;
            }

            var (s1, s2) = (random.NextDouble() * total, random.NextDouble() * total);
            if (s1 > s2)
            {
                (s1, s2) = (s2, s1);
            }

            var (i, a) = PointAt(space, points, s1);
            var (j, b) = PointAt(space, points, s2);
            if (j <= i)
            {
                continue; // Same segment: already straight.
            }

            var before = space.Distance(a, points[i + 1]) + PathLength(space, points.GetRange(i + 1, j - i)) + space.Distance(points[j], b);
            if (space.Distance(a, b) >= before - 1e-9 || !validator.IsMotionFree(a, b))
            {
                continue;
            }

            var shortened = points.Take(i + 1).ToList();
            shortened.Add(a);
            shortened.Add(b);
            shortened.AddRange(points.Skip(j + 1));
            points = RemoveDuplicates(space, shortened);
        }

        return settings.DropVisibleWaypoints ? DropVisible(points, validator, cancellationToken) : points;
    }

    /// <summary>
    /// Drops every waypoint whose neighbours see each other (the straight line between them is free), until
    /// none can go: random shortcuts leave points in the middle of segments that each cost a corner.
    /// </summary>
    private static List<double[]> DropVisible(List<double[]> points, IMotionValidator validator, CancellationToken cancellationToken)
    {
        var changed = true;
        while (changed && points.Count > 2)
        {
            changed = false;
            for (var i = 1; i + 1 < points.Count; i++)
            {
                cancellationToken.ThrowIfCancellationRequested();
                if (validator.IsMotionFree(points[i - 1], points[i + 1]))
                {
                    points.RemoveAt(i);
                    changed = true;
                    i--;
                }
            }
        }

        return points;
    }

    /// <summary>The point at arc length s, and the index of the segment it lies on.</summary>
    private static (int Segment, double[] Point) PointAt(IConfigurationSpace space, List<double[]> points, double s)
    {
        for (var i = 0; i < points.Count - 1; i++)
        {
            var length = space.Distance(points[i], points[i + 1]);
            if (s <= length || i == points.Count - 2)
            {
                return (i, space.Interpolate(points[i], points[i + 1], length > 0 ? Math.Clamp(s / length, 0, 1) : 0));
            }

            s -= length;
        }

        return (0, points[0]);
    }

    private static List<double[]> RemoveDuplicates(IConfigurationSpace space, List<double[]> points)
    {
        var result = new List<double[]> { points[0] };
        foreach (var p in points.Skip(1))
        {
            if (space.Distance(result[^1], p) > 1e-12)
            {
                result.Add(p);
            }
        }

        if (space.Distance(result[^1], points[^1]) > 0)
        {
            result[^1] = points[^1];
        }

        return result;
    }

    private static double PathLength(IConfigurationSpace space, List<double[]> points)
    {
        var length = 0.0;
        for (var i = 1; i < points.Count; i++)
        {
            length += space.Distance(points[i - 1], points[i]);
        }

        return length;
    }
}
