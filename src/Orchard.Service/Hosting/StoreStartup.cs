using Microsoft.AspNetCore.DataProtection.KeyManagement;
using Microsoft.Extensions.Options;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Hosting;

/// <summary>
/// At start: applies the migrations, says which store is in use, registers the demo arm profile if absent,
/// makes sure the shared cookie-protection key ring has a key (one process at a time, so replicas starting
/// together make one between them), and makes sure a usable admin key exists (from configuration, or a new
/// one shown once; see <see cref="BootstrapKeyNotice"/>).
/// </summary>
public sealed partial class StoreStartup(
    IOrchardStore store,
    IOptions<OrchardOptions> options,
    TimeProvider clock,
    IServiceProvider services,
    ILogger<StoreStartup> logger) : IHostedService
{
    /// <summary>Lifetime of a new cookie-protection key [90 days, as ASP.NET Core's own default].</summary>
    public static readonly TimeSpan ProtectionKeyLifetime = TimeSpan.FromDays(90);

    public async Task StartAsync(CancellationToken cancellationToken)
    {
        await store.MigrateAsync(cancellationToken);
        LogStore(logger, store.Kind);
        if (await store.GetArmProfileAsync(DemoArm.Id, cancellationToken) is null)
        {
            await store.PutArmProfileAsync(DemoArm.Id, OrchardJson.Serialize(DemoArm.Create()), null, cancellationToken);
        }

        if (services.GetService<IKeyManager>() is { } keyManager)
        {
            await store.RunExclusiveAsync("protection-keys", _ =>
            {
                var now = clock.GetUtcNow();
                if (!keyManager.GetAllKeys().Any(k => !k.IsRevoked && k.ActivationDate <= now && k.ExpirationDate > now + TimeSpan.FromDays(2)))
                {
                    keyManager.CreateNewKey(now, now + ProtectionKeyLifetime);
                }

                return Task.CompletedTask;
            }, cancellationToken);
        }

        await EnsureAdminKeyAsync(cancellationToken);
    }

    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    private async Task EnsureAdminKeyAsync(CancellationToken cancellationToken)
    {
        var now = clock.GetUtcNow();
        if (options.Value.BootstrapAdminKey is { Length: > 0 } configured)
        {
            // Added once; revoking it sticks (a revoked key is still found, so it is not added again).
            var hash = ApiKeySecrets.HashHex(configured);
            if (await store.FindApiKeyAsync(hash, cancellationToken) is null)
            {
                await store.AddApiKeyAsync(new ApiKeyRecord("key-boot-" + hash[..12], Roles.Admin, hash, "bootstrap admin", now), null, cancellationToken);
            }

            return;
        }

        var keys = await store.ListApiKeysAsync(cancellationToken);
        if (keys.Any(k => k.Role == Roles.Admin && k.IsUsableAt(now)))
        {
            return;
        }

        var secret = ApiKeySecrets.NewSecret();
        var keyId = "key-bootstrap-" + Guid.NewGuid().ToString("N")[..8];
        await store.AddApiKeyAsync(new ApiKeyRecord(keyId, Roles.Admin, ApiKeySecrets.HashHex(secret), "bootstrap admin", now), null, cancellationToken);
        await BootstrapKeyNotice.ShowAsync(keyId, secret, options.Value.DataFolder, logger, cancellationToken);
    }

    [LoggerMessage(Level = LogLevel.Information, Message = "Store in use: {Store}")]
    private static partial void LogStore(ILogger logger, string store);
}
