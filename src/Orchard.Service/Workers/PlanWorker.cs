using Microsoft.Extensions.Options;
using Orchard.Service.Application;
using Orchard.Service.Hosting;
using Orchard.Store;

namespace Orchard.Service.Workers;

/// <summary>
/// Claims plan jobs from the store's queue and runs them, outside any transaction: a lease on database
/// time, renewed at a third of its length while planning; a lost lease cancels the work, and so does a
/// renewal that finds the job superseded (its tree was scanned again); the result is written once, fenced
/// by the attempt, and never made current when it was superseded meanwhile. On shutdown a job still
/// running is released back to the queue.
/// </summary>
public sealed partial class PlanWorker(IOrchardStore store, JobSignal signal, IOptions<OrchardOptions> options, TimeProvider clock, OrchardMetrics metrics, IHostApplicationLifetime lifetime, ILogger<PlanWorker> logger) : BackgroundService
{
    private static int _counter;

    private readonly string _workerId = $"{Environment.MachineName}/{Environment.ProcessId}/{Interlocked.Increment(ref _counter)}";

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var lease = TimeSpan.FromSeconds(Math.Max(3, options.Value.LeaseSeconds));
        // Claim nothing until the host has fully started: background services run before the web server
        // binds, and a start that fails or is stopped half-way (a SIGTERM during start-up) runs no graceful
        // stop, which would strand a claimed job until its lease ran out.
        if (!await HostStartedAsync(stoppingToken))
        {
            return;
        }

        LogStarted(logger, _workerId, store.Kind);
        while (!stoppingToken.IsCancellationRequested)
        {
            JobRecord? job;
            try
            {
                job = await store.ClaimJobAsync(_workerId, lease, stoppingToken);
            }
            catch (Exception ex) when (ex is not OperationCanceledException)
            {
                LogStoreUnavailable(logger, _workerId, ex.GetBaseException().Message);
                await signal.WaitAsync(TimeSpan.FromSeconds(2), stoppingToken);
                continue;
            }

            if (job is null)
            {
                await signal.WaitAsync(TimeSpan.FromMilliseconds(500), stoppingToken);
                continue;
            }

            await RunAsync(job, lease, stoppingToken);
        }
    }

    private async Task<bool> HostStartedAsync(CancellationToken stoppingToken)
    {
        var started = new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously);
        using var onStarted = lifetime.ApplicationStarted.Register(() => started.TrySetResult());
        using var onStopping = stoppingToken.Register(() => started.TrySetCanceled(stoppingToken));
        try
        {
            await started.Task;
            return true;
        }
        catch (OperationCanceledException)
        {
            return false;
        }
    }

    private async Task RunAsync(JobRecord job, TimeSpan lease, CancellationToken stoppingToken)
    {
        using var scope = logger.BeginScope(new Dictionary<string, object> { ["JobId"] = job.JobId, ["Attempt"] = job.Attempt, ["Worker"] = _workerId, ["TreeId"] = job.TreeId });
        var began = clock.GetTimestamp();
        // The planner keeps its own deadline; should it overrun by far, the worker stops it and fails the job.
        var deadline = options.Value.PlanningDeadlineSeconds > 0 ? TimeSpan.FromSeconds(options.Value.PlanningDeadlineSeconds) : (TimeSpan?)null;
        using var backstop = deadline is { } d ? new CancellationTokenSource((2 * d) + TimeSpan.FromSeconds(30), clock) : new CancellationTokenSource();
        using var work = CancellationTokenSource.CreateLinkedTokenSource(stoppingToken, backstop.Token);
        var superseded = false;
        var heartbeat = HeartbeatAsync(job, lease, work, () => superseded = true);
        var kind = KindWord(job.Kind);
        try
        {
            LogClaimed(logger, job.JobId, kind, job.TreeId, job.Attempt);
            var result = await JobRunner.RunAsync(job, store, clock, deadline, work.Token, options.Value.AssumeFallingWood);
            var completion = await CompleteAsync(job, result, lease, work.Token);
            var elapsedMs = clock.GetElapsedTime(began).TotalMilliseconds;
            var outcome = completion.Status switch
            {
                CompletionStatus.Written => "done",
                CompletionStatus.Superseded => "superseded",
                _ => "stale",
            };
            LogFinished(logger, job.JobId, outcome, completion.Version, elapsedMs, result.StepCount, result.TotalSeconds);
            metrics.JobFinished(kind, outcome, elapsedMs / 1000);
            signal.Notify();
            if (completion.Status == CompletionStatus.Written)
            {
                foreach (var (method, count) in result.MovesByMethod)
                {
                    metrics.MovesPlanned(method, count);
                }

                metrics.MovePlans(result.MovePlansAttempted, result.MovePlansFailed);
                await TreeFeatureIndex.RecordPlanAsync(store, job.TreeId, CancellationToken.None);
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            await GiveBackAsync(job);
        }
        catch (OperationCanceledException) when (backstop.IsCancellationRequested && !stoppingToken.IsCancellationRequested)
        {
            var reason = $"Planning did not finish within {(2 * deadline!.Value) + TimeSpan.FromSeconds(30):g} (the planning deadline is {deadline.Value:g}); post the scan again, or raise Orchard:PlanningDeadlineSeconds.";
            LogFailed(logger, new TimeoutException(reason), job.JobId);
            metrics.JobFinished(kind, "failed", clock.GetElapsedTime(began).TotalSeconds);
            await FailQuietlyAsync(job, reason);
        }
        catch (OperationCanceledException) when (superseded)
        {
            LogSuperseded(logger, job.JobId);
            metrics.JobFinished(kind, "superseded", clock.GetElapsedTime(began).TotalSeconds);
            signal.Notify();
        }
        catch (OperationCanceledException)
        {
            LogLeaseLost(logger, job.JobId);
        }
        catch (Exception ex) when (StoreFaults.IsTransient(ex))
        {
            // The store went away mid-job: not the plan's fault. Give the job back (or, if the store is
            // still down, let its lease run out) so a worker plans it again once the store is back.
            LogStoreUnavailable(logger, _workerId, ex.GetBaseException().Message);
            metrics.JobFinished(kind, "storeUnavailable", clock.GetElapsedTime(began).TotalSeconds);
            await GiveBackAsync(job);
            await signal.WaitAsync(TimeSpan.FromSeconds(1), stoppingToken);
        }
        catch (Exception ex)
        {
            LogFailed(logger, ex, job.JobId);
            metrics.JobFinished(kind, "failed", clock.GetElapsedTime(began).TotalSeconds);
            await FailQuietlyAsync(job, ex.Message);
        }
        finally
        {
            await work.CancelAsync();
            await heartbeat;
        }
    }

    /// <summary>
    /// Writes the result, retrying through a store outage for up to one lease: the plan is already paid
    /// for. If the store stays down longer, the lease has run out and another worker plans the job again;
    /// the fence (job, attempt, owner) keeps a late write from landing twice.
    /// </summary>
    private async Task<CompletionResult> CompleteAsync(JobRecord job, ScheduleWrite result, TimeSpan lease, CancellationToken cancellationToken)
    {
        var giveUpAt = clock.GetTimestamp() + (long)(lease.TotalSeconds * clock.TimestampFrequency);
        while (true)
        {
            try
            {
                return await store.CompleteJobAsync(job.JobId, job.Attempt, _workerId, result, CancellationToken.None);
            }
            catch (Exception ex) when (StoreFaults.IsTransient(ex) && clock.GetTimestamp() < giveUpAt)
            {
                LogStoreUnavailable(logger, _workerId, ex.GetBaseException().Message);
                await Task.Delay(TimeSpan.FromMilliseconds(500), clock, cancellationToken);
            }
        }
    }

    private async Task FailQuietlyAsync(JobRecord job, string reason)
    {
        try
        {
            await store.FailJobAsync(job.JobId, job.Attempt, _workerId, reason, CancellationToken.None);
        }
        catch (Exception storeError) when (StoreFaults.IsTransient(storeError))
        {
            // Unrecorded; the lease runs out and the job is tried again.
            LogStoreUnavailable(logger, _workerId, storeError.GetBaseException().Message);
        }
    }

    private async Task GiveBackAsync(JobRecord job)
    {
        try
        {
            await store.ReleaseJobAsync(job.JobId, job.Attempt, _workerId, CancellationToken.None);
            LogReleased(logger, job.JobId);
        }
        catch (Exception ex) when (StoreFaults.IsTransient(ex))
        {
            // The lease runs out on its own and the job is claimed again.
            LogStoreUnavailable(logger, _workerId, ex.GetBaseException().Message);
        }
    }

    private async Task HeartbeatAsync(JobRecord job, TimeSpan lease, CancellationTokenSource work, Action onSuperseded)
    {
        while (!work.IsCancellationRequested)
        {
            try
            {
                await Task.Delay(lease / 3, clock, work.Token);
                var renewal = await store.RenewLeaseAsync(job.JobId, job.Attempt, _workerId, lease, work.Token);
                if (renewal != LeaseRenewal.Renewed)
                {
                    if (renewal == LeaseRenewal.Superseded)
                    {
                        onSuperseded();
                    }

                    await work.CancelAsync();
                }
            }
            catch (OperationCanceledException)
            {
                // Work finished or stopped.
            }
            catch (Exception ex)
            {
                // A store outage: keep planning and try again at the next beat. If the lease runs out
                // meanwhile, the fenced completion tells us.
                LogStoreUnavailable(logger, _workerId, ex.GetBaseException().Message);
            }
        }
    }

    private static string KindWord(JobKind kind) => kind == JobKind.Plan ? "plan" : "replan";

    [LoggerMessage(Level = LogLevel.Information, Message = "Planning worker {Worker} started on the {Store} store")]
    private static partial void LogStarted(ILogger logger, string worker, string store);

    [LoggerMessage(Level = LogLevel.Information, Message = "Claimed {JobId} ({Kind}) for tree {TreeId}, attempt {Attempt}")]
    private static partial void LogClaimed(ILogger logger, string jobId, string kind, string treeId, int attempt);

    [LoggerMessage(Level = LogLevel.Information, Message = "Finished {JobId}: {Outcome} (version {Version}), {ElapsedMs:F0} ms, {Steps} cuts, {TotalSeconds:F1} s schedule")]
    private static partial void LogFinished(ILogger logger, string jobId, string outcome, int? version, double elapsedMs, int steps, double totalSeconds);

    [LoggerMessage(Level = LogLevel.Information, Message = "Stopped {JobId}: superseded (its tree was scanned again, or the version it re-plans is no longer current)")]
    private static partial void LogSuperseded(ILogger logger, string jobId);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Gave {JobId} back to the queue")]
    private static partial void LogReleased(ILogger logger, string jobId);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Lost the lease on {JobId}; another worker has it")]
    private static partial void LogLeaseLost(ILogger logger, string jobId);

    [LoggerMessage(Level = LogLevel.Error, Message = "Planning {JobId} failed")]
    private static partial void LogFailed(ILogger logger, Exception exception, string jobId);

    [LoggerMessage(Level = LogLevel.Warning, Message = "Worker {Worker}: store unavailable ({Reason}), retrying")]
    private static partial void LogStoreUnavailable(ILogger logger, string worker, string reason);
}
