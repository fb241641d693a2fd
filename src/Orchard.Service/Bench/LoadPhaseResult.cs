namespace Orchard.Service.Bench;

/// <summary>
/// What one fixed-rate phase measured. Latency runs from the moment a request was due by the schedule
/// (not from when it was sent), so a server that falls behind cannot hide its queue.
/// </summary>
/// <param name="AchievedPerSecond">Successful answers per second over the phase, from its first due time to its last answer.</param>
/// <param name="Errors">Requests with no answer (transport error, timeout, shed by the client) or a 5xx or an unexpected status.</param>
internal sealed record LoadPhaseResult(
    string Name,
    double TargetPerSecond,
    double DurationSeconds,
    long Sent,
    long Succeeded,
    long Errors,
    double AchievedPerSecond,
    double LatencyP50Ms,
    double LatencyP95Ms,
    double LatencyP99Ms,
    double LatencyMaxMs,
    IReadOnlyDictionary<string, long> Statuses)
{
    public double ErrorRate => Sent == 0 ? 0 : (double)Errors / Sent;
}
