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
    /// Reads a document; problems never escape as exceptions. A syntax error comes back as one problem
    /// carrying the line and byte where reading stopped. Values of the wrong JSON type come back all at
    /// once (<see cref="JsonShapeChecker"/>), each with its JSON path, the JSON type expected and, for an
    /// enum, the values allowed.
    /// </summary>
    public static ParseResult<T> Parse<T>(string json)
        where T : class
    {
        try
        {
            var value = JsonSerializer.Deserialize<T>(json, Options);
            return value is null
                ? Failed<T>(ValidationProblem.Error("$", "json.null", "The document is empty or null."))
                : new ParseResult<T>(value, []);
        }
        catch (JsonException ex)
        {
            var shape = ShapeProblems(json, typeof(T));
            if (shape.Count > 0)
            {
                return new ParseResult<T>(null, shape);
            }

            var path = string.IsNullOrEmpty(ex.Path) ? "$" : ex.Path;
            var where = ex.LineNumber is { } line ? $" (line {line + 1}, byte {ex.BytePositionInLine + 1})" : string.Empty;
            return Failed<T>(ValidationProblem.Error(path, "json.malformed", $"Not readable as JSON{where}: {Plain(FirstSentence(ex.Message))}"));
        }
        catch (NotSupportedException ex)
        {
            return Failed<T>(ValidationProblem.Error("$", "json.unsupported", FirstSentence(ex.Message)));
        }
    }

    private static ParseResult<T> Failed<T>(ValidationProblem problem)
        where T : class => new(null, [problem]);

    /// <summary>The wrong-typed values of a syntactically valid document; empty when the syntax is wrong (or nothing is).</summary>
    private static IReadOnlyList<ValidationProblem> ShapeProblems(string json, Type type)
    {
        try
        {
            using var document = JsonDocument.Parse(json, new JsonDocumentOptions { MaxDepth = MaxDepth, AllowTrailingCommas = false, CommentHandling = JsonCommentHandling.Disallow });
            return JsonShapeChecker.Check(document.RootElement, type, Options);
        }
        catch (JsonException)
        {
            return [];
        }
    }

    /// <summary>The reader's words without the .NET type names it puts in (e.g. "could not be converted to System.Double").</summary>
    private static string Plain(string message)
    {
        var cut = message.IndexOf("could not be converted to", StringComparison.Ordinal);
        return cut > 0 ? message[..cut].TrimEnd() + " is not of the expected JSON type." : message;
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
