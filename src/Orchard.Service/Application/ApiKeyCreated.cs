namespace Orchard.Service.Application;

/// <summary>A new API key: the secret is shown once (this answer is never cached) and never again.</summary>
public sealed record ApiKeyCreated(string KeyId, string Role, string Label, string Secret, DateTimeOffset CreatedAt, DateTimeOffset? ExpiresAt);
