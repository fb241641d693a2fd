using System.Text.Json;
using System.Text.Json.Serialization;
using Orchard.Core.Serialization;

namespace Orchard.Service.Bench;

/// <summary>
/// Benchmark reports as JSON files: Orchard's shape, indented, with a figure that could not be measured (NaN,
/// say an all-pairs time not run) written as the string "NaN" instead of failing the whole report.
/// </summary>
internal static class BenchJson
{
    private static readonly JsonSerializerOptions Options = new(OrchardJson.IndentedOptions)
    {
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
    };

    public static string Text<T>(T report) => JsonSerializer.Serialize(report, Options) + "\n";
}
