namespace Orchard.Service.Auth;

/// <summary>How long a review-page session lasts at most (absolute, never renewed; never past its key's expiry).</summary>
public sealed record SessionLifetime(TimeSpan Value);
