using System.Text.Json;
using System.Text.Json.Serialization;
using Orchard.Core.Validation;

namespace Orchard.Core.Serialization;

/// <summary>
/// The one JSON shape of every Orchard document: camelCase names, enums as camelCase strings,
/// no comments or trailing commas, a bounded nesting depth. The options are frozen.
/// </summary>
public static class OrchardJson
{
    /// <summary>Deeper than any Orchard document; a hostile document nests far deeper.</summary>
    public const int MaxDepth = 16;

    public static JsonSerializerOptions Options { get; } = CreateOptions(indented: false);

    public static JsonSerializerOptions IndentedOptions { get; } = CreateOptions(indented: true);

    public static string Serialize<T>(T value, bool indented = false) =>
        JsonSerializer.Serialize(value, indented ? IndentedOptions : Options);

    /// <summary>
    /// Reads a document. Syntax and type errors come back as one error problem carrying the JSON path
    /// where reading stopped; they never escape as exceptions.
    /// </summary>
    public static ParseResult<T> Parse<T>(string json)
        where T : class
    {
        try
        {
            var value = JsonSerializer.Deserialize<T>(json, Options);
            return value is null
                ? new ParseResult<T>(null, ValidationProblem.Error("$", "json.null", "The document is empty or null."))
                : new ParseResult<T>(value, null);
        }
        catch (JsonException ex)
        {
            var path = string.IsNullOrEmpty(ex.Path) ? "$" : ex.Path;
            var where = ex.LineNumber is { } line ? $" (line {line + 1}, byte {ex.BytePositionInLine + 1})" : string.Empty;
            return new ParseResult<T>(null, ValidationProblem.Error(path, "json.malformed", $"Not readable as JSON of the expected shape{where}: {FirstSentence(ex.Message)}"));
        }
        catch (NotSupportedException ex)
        {
            return new ParseResult<T>(null, ValidationProblem.Error("$", "json.unsupported", FirstSentence(ex.Message)));
        }
    }

    private static string FirstSentence(string message)
    {
        var cut = message.IndexOf(" Path:", StringComparison.Ordinal);
        return cut > 0 ? message[..cut] : message;
    }

    private static JsonSerializerOptions CreateOptions(bool indented)
    {
        var options = new JsonSerializerOptions(JsonSerializerDefaults.Web)
        {
            WriteIndented = indented,
            NewLine = "\n",
            MaxDepth = MaxDepth,
            AllowTrailingCommas = false,
            ReadCommentHandling = JsonCommentHandling.Disallow,
            NumberHandling = JsonNumberHandling.Strict,
            DefaultIgnoreCondition = JsonIgnoreCondition.Never,
            UnmappedMemberHandling = JsonUnmappedMemberHandling.Skip,
        };
        options.MakeReadOnly(populateMissingResolver: true);
        return options;
    }
}
