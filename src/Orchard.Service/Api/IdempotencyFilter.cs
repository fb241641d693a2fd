using Orchard.Store;

namespace Orchard.Service.Api;

/// <summary>
/// Idempotent POSTs, in one place: a malformed <c>Idempotency-Key</c> is refused; a key already answered
/// in the caller's scope gets that answer again (422 when it came with another request) before the
/// handler runs. The handler passes the key to the store, which keeps the first answer in the same
/// transaction as the work, so two racing requests with one key still do the work once.
/// </summary>
public sealed class IdempotencyFilter(IOrchardStore store) : IEndpointFilter
{
    public async ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(next);
        var key = context.Arguments.OfType<IdempotencyKey>().FirstOrDefault()
            ?? throw new InvalidOperationException("An idempotent endpoint must bind an IdempotencyKey parameter.");
        if (key.IsMalformed)
        {
            return Problems.Of(400, "Bad Idempotency-Key", $"The Idempotency-Key header must be one non-blank value of at most {IdempotencyKey.MaxLength} characters.", "$header.Idempotency-Key", "idempotency.key");
        }

        if (key.Key is not null && await store.GetIdempotencyAsync(key.Scope, key.Key, context.HttpContext.RequestAborted) is { } earlier)
        {
            return Answers.Replay(earlier, key.RequestHashHex);
        }

        return await next(context);
    }
}
