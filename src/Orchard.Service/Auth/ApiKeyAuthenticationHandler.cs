using System.Security.Claims;
using System.Text.Encodings.Web;
using Microsoft.AspNetCore.Authentication;
using Microsoft.Extensions.Options;

namespace Orchard.Service.Auth;

/// <summary>
/// Authenticates the <c>X-Api-Key</c> header against the store's hashed keys; the key's role becomes a role
/// claim. A revoked or expired key fails like an unknown one, and every failure counts against the client
/// address (see <see cref="FailedAuthLimiter"/>).
/// </summary>
public sealed class ApiKeyAuthenticationHandler(
    IOptionsMonitor<AuthenticationSchemeOptions> options,
    ILoggerFactory logger,
    UrlEncoder encoder,
    ApiKeyCache keys,
    KeyUseRecorder uses,
    FailedAuthLimiter failures,
    TimeProvider clock)
    : AuthenticationHandler<AuthenticationSchemeOptions>(options, logger, encoder)
{
    public const string SchemeName = "ApiKey";

    protected override async Task<AuthenticateResult> HandleAuthenticateAsync()
    {
        if (!Request.Headers.TryGetValue(ApiKeySecrets.HeaderName, out var values) || values.Count != 1 || string.IsNullOrWhiteSpace(values[0]))
        {
            return AuthenticateResult.NoResult();
        }

        var hash = ApiKeySecrets.HashHex(values[0]!);
        var key = await keys.FindAsync(hash, Context.RequestAborted);
        if (key is null || !ApiKeySecrets.FixedTimeEquals(hash, key.SecretHashHex) || !key.IsUsableAt(clock.GetUtcNow()))
        {
            failures.Failed(Context);
            return AuthenticateResult.Fail(key is null ? "Unknown API key." : "The API key is revoked or expired.");
        }

        keys.MarkUsable(hash);
        await uses.UsedAsync(key.KeyId, Context.RequestAborted);
        var identity = new ClaimsIdentity(
            [new Claim(ClaimTypes.NameIdentifier, key.KeyId), new Claim(ClaimTypes.Role, key.Role), new Claim(ClaimTypes.Name, key.Label)],
            SchemeName);
        return AuthenticateResult.Success(new AuthenticationTicket(new ClaimsPrincipal(identity), SchemeName));
    }
}
