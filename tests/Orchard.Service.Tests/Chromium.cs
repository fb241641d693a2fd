using Microsoft.Playwright;

namespace Orchard.Service.Tests;

/// <summary>Debian's headless Chromium driven by Playwright, with the flags the closed network needs; never a downloaded browser.</summary>
internal static class Chromium
{
    public const string ExecutablePath = "/usr/bin/chromium";

    public static async Task<IBrowser> LaunchAsync(IPlaywright playwright)
    {
        ArgumentNullException.ThrowIfNull(playwright);
        await EnsureAsync();
        Assert.True(File.Exists(ExecutablePath), $"{ExecutablePath} is missing: install Debian's chromium (deploy/ensure-packages.sh chromium).");
        return await playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
        {
            ExecutablePath = ExecutablePath,
            Headless = true,
            Args = ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
        });
    }

    /// <summary>On a fresh machine the README's test command installs Debian's chromium itself (as root).</summary>
    private static async Task EnsureAsync()
    {
        if (File.Exists(ExecutablePath))
        {
            return;
        }

        using var install = System.Diagnostics.Process.Start("bash", [Path.Combine(Orchard.Store.Tests.PostgresServer.FindRepositoryRoot(), "deploy", "ensure-packages.sh"), "chromium"]);
        await install!.WaitForExitAsync();
    }
}
