namespace Orchard.Service.Application;

/// <summary>Wakes this process's workers when the API enqueues a job (workers also poll, for jobs from other processes).</summary>
public sealed class JobSignal : IDisposable
{
    private readonly SemaphoreSlim _signal = new(0, int.MaxValue);

    public void Notify() => _signal.Release();

    public async Task WaitAsync(TimeSpan timeout, CancellationToken cancellationToken)
    {
        try
        {
            await _signal.WaitAsync(timeout, cancellationToken);
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            // Shutting down.
        }
    }

    public void Dispose() => _signal.Dispose();
}
