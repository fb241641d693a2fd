using System.Security.Cryptography;
using System.Text;

namespace Orchard.Service.Auth;

/// <summary>API key secrets: made from 32 random bytes, stored only as their SHA-256, compared in fixed time.</summary>
public static class ApiKeySecrets
{
    public const string HeaderName = "X-Api-Key";

    public static string NewSecret() => "ok_" + Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(32));

    public static string HashHex(string secret) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(secret)));

    public static bool FixedTimeEquals(string hashHexA, string hashHexB) =>
        CryptographicOperations.FixedTimeEquals(Encoding.ASCII.GetBytes(hashHexA), Encoding.ASCII.GetBytes(hashHexB));
}
