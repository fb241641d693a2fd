using System.Security.Claims;
using System.Security.Cryptography;
using System.Text;
using Orchard.Service.Application;

namespace Orchard.Service.Api;

/// <summary>
/// The <c>Idempotency-Key</c> request header, bound as an endpoint parameter: the key (null when absent),
/// the caller's scope (its API key id) and the hash of the request (method, path and body), so the same key
/// with another request is told apart. <see cref="IdempotencyFilter"/> replays an earlier answer.
/// </summary>
public sealed class IdempotencyKey
{
    public const string HeaderName = "Idempotency-Key";

    public const int MaxLength = 200;

    private IdempotencyKey(string? key, bool malformed, string scope, string requestHashHex)
    {
        Key = key;
        IsMalformed = malformed;
        Scope = scope;
        RequestHashHex = requestHashHex;
    }

    public string? Key { get; }

    /// <summary>Present but unusable: blank, repeated or longer than <see cref="MaxLength"/>.</summary>
    public bool IsMalformed { get; }

    public string Scope { get; }

    public string RequestHashHex { get; }

    /// <summary>What the handler hands to the store; null without a key.</summary>
    public IdempotencyContext? Context => Key is null ? null : new IdempotencyContext(Scope, Key, RequestHashHex);

    public static async ValueTask<IdempotencyKey?> BindAsync(HttpContext context)
    {
        ArgumentNullException.ThrowIfNull(context);
        var scope = context.User.FindFirstValue(ClaimTypes.NameIdentifier) ?? "anonymous";
        if (!context.Request.Headers.TryGetValue(HeaderName, out var values))
        {
            return new IdempotencyKey(null, false, scope, string.Empty);
        }

        var key = values.ToString();
        if (string.IsNullOrWhiteSpace(key) || key.Length > MaxLength || values.Count != 1)
        {
            return new IdempotencyKey(null, true, scope, string.Empty);
        }

        var body = await JsonBody.ReadAsync(context);
        using var hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        hash.AppendData(Encoding.UTF8.GetBytes($"{context.Request.Method} {context.Request.Path.Value}\n"));
        hash.AppendData(body);
        return new IdempotencyKey(key, false, scope, Convert.ToHexStringLower(hash.GetHashAndReset()));
    }
}
