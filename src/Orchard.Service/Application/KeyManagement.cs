using Orchard.Core.Validation;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Application;

/// <summary>
/// API keys, for admins: make one (its secret shown once, an expiry if asked), list them with their last
/// use, revoke one (its review sessions end with it; the last usable admin key cannot be revoked). Rotation
/// is making the new key, moving the client to it, then revoking the old one. Every change is audited.
/// </summary>
public sealed class KeyManagement(IOrchardStore store, ApiKeyCache cache, TimeProvider clock)
{
    public const int MaxLabelLength = 100;

    public async Task<IntakeAnswer> CreateAsync(ReadOnlyMemory<byte> body, Caller caller, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(caller);
        var (request, unreadable) = DocumentReader.Read<ApiKeyRequest>(body);
        if (request is null)
        {
            return new IntakeAnswer.Refused(400, "The key request is not readable", unreadable);
        }

        var now = clock.GetUtcNow();
        var problems = new List<ValidationProblem>();
        if (request.Role is not { } role || !Roles.All.Contains(role))
        {
            problems.Add(ValidationProblem.Error("$.role", "role.unknown", "role must be tablet, controller, manager or admin."));
        }

        var label = string.IsNullOrWhiteSpace(request.Label) ? request.Role ?? string.Empty : request.Label.Trim();
        if (label.Length > MaxLabelLength || label.Any(char.IsControl))
        {
            problems.Add(ValidationProblem.Error("$.label", "label.invalid", $"label must be at most {MaxLabelLength} characters, without control characters."));
        }

        if (request.ExpiresAt is { } expires && expires <= now)
        {
            problems.Add(ValidationProblem.Error("$.expiresAt", "expiresAt.past", "expiresAt must be in the future."));
        }

        if (problems.Count > 0)
        {
            return new IntakeAnswer.Refused(422, "The key request is not valid", problems);
        }

        var secret = ApiKeySecrets.NewSecret();
        var keyId = "key-" + Guid.NewGuid().ToString("N")[..12];
        await store.AddApiKeyAsync(new ApiKeyRecord(keyId, request.Role!, ApiKeySecrets.HashHex(secret), label, now) { ExpiresAt = request.ExpiresAt }, caller.KeyId, cancellationToken);
        return new IntakeAnswer.Accepted(201, new ApiKeyCreated(keyId, request.Role!, label, secret, now, request.ExpiresAt), $"/api/v1/api-keys/{keyId}") { CarriesSecret = true };
    }

    public async Task<IReadOnlyList<ApiKeyView>> ListAsync(CancellationToken cancellationToken)
    {
        var now = clock.GetUtcNow();
        return (await store.ListApiKeysAsync(cancellationToken))
            .Select(k => new ApiKeyView(k.KeyId, k.Role, k.Label, k.CreatedAt, k.ExpiresAt, k.RevokedAt, k.LastUsedAt, k.Demo, k.IsUsableAt(now)))
            .ToList();
    }

    public async Task<IntakeAnswer> RevokeAsync(string keyId, Caller caller, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(caller);
        var result = await store.RevokeApiKeyAsync(keyId, caller.KeyId, cancellationToken);
        switch (result)
        {
            case RevokeResult.Revoked:
            case RevokeResult.AlreadyRevoked:
                cache.Forget(keyId);
                return new IntakeAnswer.Accepted(204, new object(), null);
            case RevokeResult.LastAdmin:
                return IntakeAnswer.Refused.One(409, "The last admin key", "$path.keyId", "key.lastAdmin", "This is the last usable admin key; make another admin key before revoking it.");
            default:
                return IntakeAnswer.Refused.One(404, "No such key", "$path.keyId", "key.unknown", $"No API key '{keyId}'.");
        }
    }

    public async Task<IReadOnlyList<AuditView>> AuditAsync(int? limit, CancellationToken cancellationToken) =>
        (await store.ListAuditAsync(Math.Clamp(limit ?? 100, 1, 1000), cancellationToken))
            .Select(a => new AuditView(a.AuditId, a.At, a.KeyId, a.Action, a.Target, a.Detail))
            .ToList();
}
