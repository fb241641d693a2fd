using Orchard.Core.Demo;
using Orchard.Core.Model;
using Orchard.Core.Serialization;

namespace Orchard.Service.Cli;

/// <summary>Writes the demo orchard as files a tablet or an operator would hand to the service.</summary>
internal static class DemoExporter
{
    /// <summary>Writes one <c>TREEID.json</c> scan per tree, <c>arm.json</c> and <c>orchard.json</c> (the row registry, as <c>PUT /api/v1/rows</c> takes it); returns the paths written.</summary>
    public static async Task<IReadOnlyList<string>> ExportAsync(DemoOrchard orchard, ArmProfile arm, string directory, CancellationToken cancellationToken)
    {
        var folder = CliFiles.CreateFolder(directory, "demo export");
        var written = new List<string>();

        async Task WriteAsync<T>(string name, T value)
        {
            var path = Path.Combine(folder, name);
            await CliFiles.WriteTextAsync(path, OrchardJson.Serialize(value, indented: true) + "\n", "demo export", stdout: null, cancellationToken);
            written.Add(path);
        }

        foreach (var tree in orchard.Trees)
        {
            await WriteAsync($"{tree.Scan.TreeId}.json", tree.Scan);
        }

        await WriteAsync("arm.json", arm);
        await WriteAsync("orchard.json", orchard.Registry());
        return written;
    }
}
