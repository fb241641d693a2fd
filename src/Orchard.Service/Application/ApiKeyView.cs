namespace Orchard.Service.Application;

/// <summary>An API key as listed: never its secret; when it was last used (to within a minute), expires, was revoked; whether the demo made it.</summary>
public sealed record ApiKeyView(string KeyId, string Role, string Label, DateTimeOffset CreatedAt, DateTimeOffset? ExpiresAt, DateTimeOffset? RevokedAt, DateTimeOffset? LastUsedAt, bool Demo, bool Usable);
