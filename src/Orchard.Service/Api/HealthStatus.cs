namespace Orchard.Service.Api;

/// <summary>A health answer: <c>live</c>, or <c>ready</c> with the store in use.</summary>
public sealed record HealthStatus(string Status, string? Store = null);
