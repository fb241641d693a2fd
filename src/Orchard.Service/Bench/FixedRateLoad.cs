using System.Diagnostics;

namespace Orchard.Service.Bench;

/// <summary>
/// An open-loop load generator: request i is due at start + i / rate whatever happened to the ones before
/// it, and its latency counts from that due time. (A closed loop, where each client waits for its answer
/// before sending again, lowers the offered rate exactly when the server slows down and so under-reports
/// the tail; this is the "coordinated omission" that fixed-rate tools avoid.)
/// </summary>
internal static class FixedRateLoad
{
    /// <summary>Requests still unanswered beyond this many are not sent but counted as errors: the server has fallen hopelessly behind.</summary>
    public const int MaxInFlight = 20_000;

    public static async Task<LoadPhaseResult> RunAsync(HttpClient http, LoadPhase phase, Func<int, bool> isSuccess, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(http);
        ArgumentNullException.ThrowIfNull(phase);
        var total = phase.TotalRequests;
        var latencyTicks = new long[total];
        var statuses = new int[total];
        var inFlight = 0;
        var lastAnswer = 0L;
        var pending = new List<Task>((int)Math.Min(total, 1_000_000));
        var ticksPerRequest = Stopwatch.Frequency / phase.RatePerSecond;
        var start = Stopwatch.GetTimestamp();

        for (long next = 0; next < total;)
        {
            var now = Stopwatch.GetTimestamp();
            var due = Math.Min(total, (long)((now - start) / ticksPerRequest) + 1);
            for (; next < due; next++)
            {
                var dueAt = start + (long)(next * ticksPerRequest);
                if (Volatile.Read(ref inFlight) >= MaxInFlight)
                {
                    statuses[next] = -2;
                    continue;
                }

                Interlocked.Increment(ref inFlight);
                pending.Add(SendAsync(next, dueAt));
            }

            // About a millisecond between batches; requests due meanwhile go out together, and their
            // latency still counts from their own due time.
            await Task.Delay(1, cancellationToken);
        }

        await Task.WhenAll(pending);
        var durationTicks = Math.Max(1, lastAnswer - start);

        var byStatus = new SortedDictionary<string, long>(StringComparer.Ordinal);
        var latenciesMs = new List<double>(statuses.Length);
        long succeeded = 0;
        for (var i = 0; i < total; i++)
        {
            var key = statuses[i] switch { -1 => "no answer", -2 => "shed", var s => s.ToString(System.Globalization.CultureInfo.InvariantCulture) };
            byStatus[key] = byStatus.GetValueOrDefault(key) + 1;
            if (statuses[i] > 0 && isSuccess(statuses[i]))
            {
                succeeded++;
                latenciesMs.Add(latencyTicks[i] * 1000.0 / Stopwatch.Frequency);
            }
        }

        latenciesMs.Sort();
        return new LoadPhaseResult(
            phase.Name,
            phase.RatePerSecond,
            phase.Duration.TotalSeconds,
            total,
            succeeded,
            total - succeeded,
            succeeded / (durationTicks / (double)Stopwatch.Frequency),
            NearestRank(latenciesMs, 0.50),
            NearestRank(latenciesMs, 0.95),
            NearestRank(latenciesMs, 0.99),
            latenciesMs.Count == 0 ? double.NaN : latenciesMs[^1],
            byStatus);

        async Task SendAsync(long index, long dueAt)
        {
            // Off the scheduling loop at once, so building and sending never delays the next due request.
            await Task.Yield();
            try
            {
                using var request = phase.NewRequest(index);
                // The whole body is read (into nothing: the generator spends its share of the machine on sending).
                using var response = await http.SendAsync(request, HttpCompletionOption.ResponseHeadersRead, cancellationToken);
                await using (var content = await response.Content.ReadAsStreamAsync(cancellationToken))
                {
                    await content.CopyToAsync(Stream.Null, cancellationToken);
                }

                var answeredAt = Stopwatch.GetTimestamp();
                statuses[index] = (int)response.StatusCode;
                latencyTicks[index] = answeredAt - dueAt;
                InterlockedMax(ref lastAnswer, answeredAt);
            }
            catch (Exception e) when (e is HttpRequestException or TaskCanceledException or IOException)
            {
                statuses[index] = -1;
            }
            finally
            {
                Interlocked.Decrement(ref inFlight);
            }
        }
    }

    /// <summary>The nearest-rank percentile of sorted values (the smallest value with at least that share at or below it).</summary>
    public static double NearestRank(IReadOnlyList<double> sorted, double share)
    {
        ArgumentNullException.ThrowIfNull(sorted);
        if (sorted.Count == 0)
        {
            return double.NaN;
        }

        var rank = (int)Math.Ceiling(share * sorted.Count);
        return sorted[Math.Clamp(rank - 1, 0, sorted.Count - 1)];
    }

    private static void InterlockedMax(ref long target, long value)
    {
        var seen = Volatile.Read(ref target);
        while (value > seen)
        {
            var previous = Interlocked.CompareExchange(ref target, value, seen);
            if (previous == seen)
            {
                return;
            }

            seen = previous;
        }
    }
}
