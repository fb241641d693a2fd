namespace Orchard.Store;

/// <summary>A signed-in review page: the cookie names <see cref="SessionId"/>; it ends at <see cref="ExpiresAt"/>, on sign-out, or when its key is revoked or expires.</summary>
public sealed record SessionRecord(string SessionId, string KeyId, DateTimeOffset CreatedAt, DateTimeOffset ExpiresAt, DateTimeOffset? RevokedAt);

/// <summary>A session with the key it was opened with.</summary>
public sealed record SessionLookup(SessionRecord Session, ApiKeyRecord Key)
{
    /// <summary>Neither the session nor its key revoked, and neither expired at <paramref name="now"/>.</summary>
    public bool IsLiveAt(DateTimeOffset now) => Session.RevokedAt is null && now < Session.ExpiresAt && Key.IsUsableAt(now);
}

public enum RevokeResult
{
    Revoked,
    NotFound,
    AlreadyRevoked,

    /// <summary>Refused: it is the last usable admin key, and revoking it would lock every admin out.</summary>
    LastAdmin,
}

/// <summary>One line of the audit trail: which key (null for the service itself) did what to what.</summary>
/// <param name="Action">A stable word, e.g. <c>scan.accepted</c>, <c>outcome.recorded</c>, <c>replan.enqueued</c>, <c>key.revoked</c>.</param>
/// <param name="Target">What it was done to, e.g. a tree id or a key id.</param>
public sealed record AuditEntry(string? KeyId, string Action, string Target, string? Detail = null);

public sealed record AuditRecord(long AuditId, DateTimeOffset At, string? KeyId, string Action, string Target, string? Detail);

/// <summary>One key of the data-protection key ring, as the XML element ASP.NET Core writes.</summary>
public sealed record ProtectionKeyRecord(string Name, string Xml);
