namespace Orchard.Service.Bench;

/// <summary>Medians and percentiles of measured runs.</summary>
internal static class BenchStatistics
{
    public static double Median(IEnumerable<double> values) => Percentile(values, 0.5);

    /// <summary>Linear interpolation between closest ranks.</summary>
    public static double Percentile(IEnumerable<double> values, double share)
    {
        var sorted = values.Order().ToArray();
        if (sorted.Length == 0)
        {
            return double.NaN;
        }

        var rank = share * (sorted.Length - 1);
        var low = (int)Math.Floor(rank);
        var high = (int)Math.Ceiling(rank);
        return sorted[low] + ((sorted[high] - sorted[low]) * (rank - low));
    }
}
