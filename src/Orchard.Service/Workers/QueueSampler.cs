using Orchard.Service.Hosting;
using Orchard.Store;

namespace Orchard.Service.Workers;

/// <summary>Samples the queue's figures from the store every few seconds for the metrics (gauges cannot call the store themselves).</summary>
public sealed class QueueSampler(IOrchardStore store, OrchardMetrics metrics) : BackgroundService
{
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(TimeSpan.FromSeconds(5));
        do
        {
            try
            {
                var figures = await store.GetQueueFiguresAsync(stoppingToken);
                metrics.QueuedJobs = figures.Queued;
                metrics.RunningJobs = figures.Running;
                metrics.OldestQueuedSeconds = figures.OldestQueuedSeconds;
            }
            catch (Exception ex) when (ex is not OperationCanceledException)
            {
                // The store is down; the readiness probe says so. Keep the last figures.
            }
        }
        while (await timer.WaitForNextTickAsync(stoppingToken));
    }
}
