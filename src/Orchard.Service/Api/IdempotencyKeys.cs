using System.Security.Cryptography;
using System.Text;

namespace Orchard.Service.Api;

/// <summary>The <c>Idempotency-Key</c> request header: a retried POST with the same key and body gets the first answer.</summary>
public static class IdempotencyKeys
{
    public const string HeaderName = "Idempotency-Key";

    public const int MaxLength = 200;

    /// <summary>The key, null when absent; "" when present but unusable (too long or blank).</summary>
    public static string? From(HttpRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        if (!request.Headers.TryGetValue(HeaderName, out var values))
        {
            return null;
        }

        var key = values.ToString();
        return string.IsNullOrWhiteSpace(key) || key.Length > MaxLength || values.Count != 1 ? string.Empty : key;
    }

    public static string Hash(string body) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(body)));
}
