using Microsoft.Extensions.Options;
using Orchard.Service.Hosting;

namespace Orchard.Service.Cli;

/// <summary><c>serve</c>: the API (and, on the embedded store, an in-process worker); <c>worker</c>: planning workers only.</summary>
internal static class ServeVerb
{
    public static async Task<int> RunAsync(string[] args, bool withApi, CancellationToken cancellationToken)
    {
        // ASP.NET Core reads --urls, --environment and Orchard:* settings from these arguments itself.
        var app = OrchardHost.Build(args, withApi, withWorkers: true);
        var options = app.Services.GetRequiredService<IOptions<OrchardOptions>>().Value;
        if (string.IsNullOrWhiteSpace(options.PostgresConnectionString))
        {
            await Console.Out.WriteLineAsync($"Embedded store: {Path.GetFullPath(Path.Combine(options.DataFolder, "orchard.db"))}");
        }

        await app.RunAsync(cancellationToken);
        return 0;
    }
}
