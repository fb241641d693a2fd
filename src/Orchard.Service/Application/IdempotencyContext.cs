using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// An idempotent POST's key in the caller's scope, and the hash of the request it was first sent with. The
/// handler hands it to the store with the answer to keep, so the work and its answer commit together.
/// </summary>
public sealed record IdempotencyContext(string Scope, string Key, string RequestHashHex)
{
    public IdempotencyRequest ToRequest(Func<string?, StoredAnswer> answer) => new(Scope, Key, RequestHashHex, answer);
}
