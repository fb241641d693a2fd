using System.Security.Claims;

namespace Orchard.Service.Application;

/// <summary>Who is asking: the API key (or the key behind a review session) and its role.</summary>
public sealed record Caller(string KeyId, string Role)
{
    public static Caller Of(ClaimsPrincipal user)
    {
        ArgumentNullException.ThrowIfNull(user);
        return new Caller(user.FindFirstValue(ClaimTypes.NameIdentifier) ?? "anonymous", user.FindFirstValue(ClaimTypes.Role) ?? string.Empty);
    }
}
