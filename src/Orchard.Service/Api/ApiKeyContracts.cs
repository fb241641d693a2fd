namespace Orchard.Service.Api;

/// <summary>A new API key: the secret is shown once and never again.</summary>
public sealed record ApiKeyCreated(string KeyId, string Role, string Label, string Secret, DateTimeOffset? ExpiresAt);

/// <summary>Asks for a new API key; <see cref="ExpiresAt"/> (optional, in the future) ends it by itself.</summary>
public sealed record ApiKeyRequest(string? Role, string? Label, DateTimeOffset? ExpiresAt);
