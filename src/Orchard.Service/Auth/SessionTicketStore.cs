using System.Security.Claims;
using System.Security.Cryptography;
using Microsoft.AspNetCore.Authentication;
using Microsoft.AspNetCore.Authentication.Cookies;
using Orchard.Store;

namespace Orchard.Service.Auth;

/// <summary>
/// Review-page sessions live in the store; the cookie carries only the session's id (protected by the
/// key ring every replica shares). A session is honoured while it is not signed out, has not expired (an
/// absolute lifetime, no sliding renewal, never past its key's expiry) and its key is neither revoked nor
/// expired. Whatever key signed in, the session's role is manager: the page reads, it never changes things.
/// </summary>
public sealed class SessionTicketStore(IOrchardStore store, TimeProvider clock) : ITicketStore
{
    /// <summary>The claim that names the session, for sign-out and the rate limiter.</summary>
    public const string SessionClaim = "orchard:session";

    public Task<string> StoreAsync(AuthenticationTicket ticket) => StoreAsync(ticket, CancellationToken.None);

    public async Task<string> StoreAsync(AuthenticationTicket ticket, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(ticket);
        var keyId = ticket.Principal.FindFirstValue(ClaimTypes.NameIdentifier) ?? throw new InvalidOperationException("A review session needs the key that opened it.");
        var now = clock.GetUtcNow();
        var expires = ticket.Properties.ExpiresUtc ?? throw new InvalidOperationException("A review session needs an expiry.");
        var sessionId = "sess-" + Convert.ToHexStringLower(RandomNumberGenerator.GetBytes(24));
        await store.CreateSessionAsync(new SessionRecord(sessionId, keyId, now, expires, null), cancellationToken);
        return sessionId;
    }

    public Task<string> StoreAsync(AuthenticationTicket ticket, HttpContext httpContext, CancellationToken cancellationToken) => StoreAsync(ticket, cancellationToken);

    /// <summary>Sessions are not renewed: their expiry is fixed when they open.</summary>
    public Task RenewAsync(string key, AuthenticationTicket ticket) => Task.CompletedTask;

    public Task RenewAsync(string key, AuthenticationTicket ticket, CancellationToken cancellationToken) => Task.CompletedTask;

    public Task RenewAsync(string key, AuthenticationTicket ticket, HttpContext httpContext, CancellationToken cancellationToken) => Task.CompletedTask;

    public Task<AuthenticationTicket?> RetrieveAsync(string key) => RetrieveAsync(key, CancellationToken.None);

    public async Task<AuthenticationTicket?> RetrieveAsync(string key, CancellationToken cancellationToken)
    {
        var found = await store.GetSessionAsync(key, cancellationToken);
        if (found is null || !found.IsLiveAt(clock.GetUtcNow()))
        {
            return null;
        }

        var identity = new ClaimsIdentity(
            [
                new Claim(ClaimTypes.NameIdentifier, found.Key.KeyId),
                new Claim(ClaimTypes.Role, Roles.Manager),
                new Claim(ClaimTypes.Name, found.Key.Label),
                new Claim(SessionClaim, found.Session.SessionId),
            ],
            CookieAuthenticationDefaults.AuthenticationScheme);
        var properties = new AuthenticationProperties { IssuedUtc = found.Session.CreatedAt, ExpiresUtc = found.Session.ExpiresAt, AllowRefresh = false };
        return new AuthenticationTicket(new ClaimsPrincipal(identity), properties, CookieAuthenticationDefaults.AuthenticationScheme);
    }

    public Task<AuthenticationTicket?> RetrieveAsync(string key, HttpContext httpContext, CancellationToken cancellationToken) => RetrieveAsync(key, cancellationToken);

    public Task RemoveAsync(string key) => RemoveAsync(key, CancellationToken.None);

    public Task RemoveAsync(string key, CancellationToken cancellationToken) => store.RevokeSessionAsync(key, cancellationToken);

    public Task RemoveAsync(string key, HttpContext httpContext, CancellationToken cancellationToken) => RemoveAsync(key, cancellationToken);
}
