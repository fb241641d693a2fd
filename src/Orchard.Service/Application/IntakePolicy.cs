namespace Orchard.Service.Application;

/// <summary>Limits the intake handlers apply, from the service's options.</summary>
/// <param name="MaxOpenJobsPerKey">Open (queued or running) plan jobs one key may have; past it, 429.</param>
/// <param name="QuotaRetryAfterSeconds">The Retry-After sent with that 429.</param>
public sealed record IntakePolicy(int MaxOpenJobsPerKey, int QuotaRetryAfterSeconds);
