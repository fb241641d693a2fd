namespace Orchard.Service.Application;

/// <summary>Asks for a new API key; <see cref="ExpiresAt"/> (optional, in the future) ends it by itself.</summary>
public sealed record ApiKeyRequest(string? Role, string? Label, DateTimeOffset? ExpiresAt);
