namespace Orchard.Core.Planning;

/// <summary>Euclidean joint-space arithmetic (joint units as they are: radians, and metres for a lift).</summary>
public static class JointSpace
{
    public static double Distance(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var sum = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            var d = a[i] - b[i];
            sum += d * d;
        }

        return Math.Sqrt(sum);
    }

    public static double[] Lerp(ReadOnlySpan<double> a, ReadOnlySpan<double> b, double t)
    {
        var q = new double[a.Length];
        for (var i = 0; i < q.Length; i++)
        {
            q[i] = a[i] + ((b[i] - a[i]) * t);
        }

        return q;
    }

    public static double PathLength(IReadOnlyList<double[]> path)
    {
        var length = 0.0;
        for (var i = 1; i < path.Count; i++)
        {
            length += Distance(path[i - 1], path[i]);
        }

        return length;
    }
}
