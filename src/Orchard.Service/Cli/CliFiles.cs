using System.Text;

namespace Orchard.Service.Cli;

/// <summary>
/// Files named on the command line. A relative path means the folder the user ran the command from (the
/// process's current folder; see RunWorkingDirectory in the project file for <c>dotnet run</c>), and every
/// message names the full path that was tried.
/// </summary>
internal static class CliFiles
{
    private static readonly UTF8Encoding Utf8 = new(encoderShouldEmitUTF8Identifier: false);

    /// <summary>Reads a whole text file; a missing or unreadable one is a <see cref="CliFileException"/> naming its full path.</summary>
    public static async Task<string> ReadTextAsync(string path, string what, CancellationToken cancellationToken)
    {
        var full = Path.GetFullPath(path);
        try
        {
            return await File.ReadAllTextAsync(full, cancellationToken);
        }
        catch (Exception ex) when (ex is FileNotFoundException or DirectoryNotFoundException)
        {
            throw new CliFileException($"{what}: no such file: {full}");
        }
        catch (Exception ex) when (ex is UnauthorizedAccessException or IOException)
        {
            throw new CliFileException($"{what}: cannot read {full}: {ex.Message}");
        }
    }

    /// <summary>Makes a folder (and its parents); failures name the full path. Returns the full path.</summary>
    public static string CreateFolder(string path, string what)
    {
        var full = Path.GetFullPath(path);
        try
        {
            Directory.CreateDirectory(full);
            return full;
        }
        catch (Exception ex) when (ex is UnauthorizedAccessException or IOException)
        {
            throw new CliFileException($"{what}: cannot make the folder {full}: {ex.Message}");
        }
    }

    /// <summary>Writes a text file (UTF-8, no byte-order mark) and says where on <paramref name="stdout"/> (when given); failures name the full path.</summary>
    public static async Task WriteTextAsync(string path, string text, string what, TextWriter? stdout, CancellationToken cancellationToken)
    {
        var full = Path.GetFullPath(path);
        try
        {
            await File.WriteAllTextAsync(full, text, Utf8, cancellationToken);
        }
        catch (DirectoryNotFoundException)
        {
            throw new CliFileException($"{what}: cannot write {full}: the folder {Path.GetDirectoryName(full)} does not exist");
        }
        catch (Exception ex) when (ex is UnauthorizedAccessException or IOException)
        {
            throw new CliFileException($"{what}: cannot write {full}: {ex.Message}");
        }

        if (stdout is not null)
        {
            await stdout.WriteLineAsync($"Wrote {full}.");
        }
    }
}
