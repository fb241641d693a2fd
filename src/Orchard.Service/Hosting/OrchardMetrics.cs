using System.Diagnostics.Metrics;

namespace Orchard.Service.Hosting;

/// <summary>
/// The service's meters (OpenTelemetry, scraped at <c>/metrics</c> in the Prometheus text format):
/// queue depth and the age of the oldest queued job (sampled from the store), plan durations, and
/// moves by the method that planned them.
/// </summary>
public sealed class OrchardMetrics : IDisposable
{
    public const string MeterName = "Orchard";

    private readonly Meter _meter = new(MeterName, "1.0");
    private readonly Histogram<double> _planSeconds;
    private readonly Counter<long> _moves;
    private readonly Counter<long> _jobs;
    private readonly Counter<long> _movePlans;

    public OrchardMetrics()
    {
        _planSeconds = _meter.CreateHistogram<double>("orchard.plan.duration", "s", "Wall time of a plan or re-plan job, claim to result.");
        _moves = _meter.CreateCounter<long>("orchard.moves", "{move}", "Travel moves in written schedules, by the method that planned them.");
        _jobs = _meter.CreateCounter<long>("orchard.jobs", "{job}", "Finished plan jobs, by kind and outcome.");
        _movePlans = _meter.CreateCounter<long>("orchard.move_plans", "{move}", "Moves the collision-aware planner was asked for in written schedules, by outcome (solved, failed); with orchard.moves by method, the planner's success.");
        _meter.CreateObservableGauge("orchard.queue.depth", () => QueuedJobs, "{job}", "Plan jobs waiting in the queue.");
        _meter.CreateObservableGauge("orchard.queue.running", () => RunningJobs, "{job}", "Plan jobs being planned now.");
        _meter.CreateObservableGauge("orchard.queue.oldest_age", () => OldestQueuedSeconds, "s", "Age of the oldest queued job.");
    }

    public long QueuedJobs { get; set; }

    public long RunningJobs { get; set; }

    public double OldestQueuedSeconds { get; set; }

    public void JobFinished(string kind, string outcome, double seconds)
    {
        _planSeconds.Record(seconds, new KeyValuePair<string, object?>("kind", kind));
        _jobs.Add(1, new KeyValuePair<string, object?>("kind", kind), new KeyValuePair<string, object?>("outcome", outcome));
    }

    public void MovesPlanned(string method, long count) => _moves.Add(count, new KeyValuePair<string, object?>("method", method));

    public void MovePlans(int attempted, int failed)
    {
        _movePlans.Add(Math.Max(0, attempted - failed), new KeyValuePair<string, object?>("outcome", "solved"));
        _movePlans.Add(failed, new KeyValuePair<string, object?>("outcome", "failed"));
    }

    public void Dispose() => _meter.Dispose();
}
