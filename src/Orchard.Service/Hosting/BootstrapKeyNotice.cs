using System.Text;

namespace Orchard.Service.Hosting;

/// <summary>
/// Shows a newly made admin key's secret once, to a person, never to the log stream: on an interactive
/// terminal it is written to the console (not through the logger); when output goes elsewhere (a container
/// log, a file), it is written to a file only this user can read (mode 0600) in the data folder, and the log
/// says where, without the secret.
/// </summary>
public static partial class BootstrapKeyNotice
{
    public const string FileName = "bootstrap-admin-key.txt";

    public static async Task ShowAsync(string keyId, string secret, string dataFolder, ILogger logger, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(logger);
        if (!Console.IsOutputRedirected)
        {
            await Console.Out.WriteLineAsync($"First start: an admin API key was made ({keyId}). It is shown once; keep it: {secret}");
            return;
        }

        Directory.CreateDirectory(dataFolder);
        var path = Path.GetFullPath(Path.Combine(dataFolder, FileName));
        var options = new FileStreamOptions { Mode = FileMode.Create, Access = FileAccess.Write };
        if (!OperatingSystem.IsWindows())
        {
            options.UnixCreateMode = UnixFileMode.UserRead | UnixFileMode.UserWrite;
        }

        await using (var file = new StreamWriter(path, Encoding.UTF8, options))
        {
            await file.WriteLineAsync($"Orchard admin API key {keyId} (made at first start; delete this file once the key is kept elsewhere):");
            await file.WriteLineAsync(secret);
        }

        if (!OperatingSystem.IsWindows())
        {
            File.SetUnixFileMode(path, UnixFileMode.UserRead | UnixFileMode.UserWrite);
        }

        LogWritten(logger, keyId, path);
    }

    [LoggerMessage(Level = LogLevel.Warning, Message = "First start: admin API key {KeyId} was made; its secret is in {Path} (readable by this user only), not in the log. Keep it and delete the file.")]
    private static partial void LogWritten(ILogger logger, string keyId, string path);
}
