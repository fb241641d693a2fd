using Microsoft.Extensions.Options;
using Orchard.Core.Demo;
using Orchard.Core.Serialization;
using Orchard.Service.Auth;
using Orchard.Store;

namespace Orchard.Service.Hosting;

/// <summary>
/// At start: applies the migrations, says which store is in use, registers the demo arm profile if absent,
/// and makes sure an admin key exists (from configuration, or a new one printed once).
/// </summary>
public sealed partial class StoreStartup(IOrchardStore store, IOptions<OrchardOptions> options, TimeProvider clock, ILogger<StoreStartup> logger) : IHostedService
{
    public async Task StartAsync(CancellationToken cancellationToken)
    {
        await store.MigrateAsync(cancellationToken);
        LogStore(logger, store.Kind);
        if (await store.GetArmProfileAsync(DemoArm.Id, cancellationToken) is null)
        {
            await store.PutArmProfileAsync(DemoArm.Id, OrchardJson.Serialize(DemoArm.Create()), null, cancellationToken);
        }

        if (options.Value.BootstrapAdminKey is { Length: > 0 } configured)
        {
            if (await store.FindApiKeyAsync(ApiKeySecrets.HashHex(configured), cancellationToken) is null)
            {
                var hash = ApiKeySecrets.HashHex(configured);
                await store.AddApiKeyAsync(new ApiKeyRecord("key-boot-" + hash[..12], Roles.Admin, hash, "bootstrap admin", clock.GetUtcNow()), null, cancellationToken);
            }
        }
        else if (await store.CountApiKeysAsync(cancellationToken) == 0)
        {
            var secret = ApiKeySecrets.NewSecret();
            await store.AddApiKeyAsync(new ApiKeyRecord("key-bootstrap", Roles.Admin, ApiKeySecrets.HashHex(secret), "bootstrap admin", clock.GetUtcNow()), null, cancellationToken);
            await Console.Out.WriteLineAsync($"First start: an admin API key was made. It is shown once; keep it: {secret}");
        }
    }

    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    [LoggerMessage(Level = LogLevel.Information, Message = "Store in use: {Store}")]
    private static partial void LogStore(ILogger logger, string store);
}
