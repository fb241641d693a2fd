using System.Text;
using System.Text.Json;
using System.Text.Json.Serialization.Metadata;
using System.Text.Unicode;
using Orchard.Core.Serialization;
using Orchard.Core.Validation;

namespace Orchard.Service.Application;

/// <summary>
/// Reads a request body (UTF-8 JSON) as a document, strictly, so what is stored is exactly what was read:
/// invalid UTF-8 anywhere in a string or member name is refused (never replaced); a member that appears
/// twice, in any case (<c>nodes</c> and <c>Nodes</c>), is refused, since members are matched regardless of
/// case; a member the document type does not have is refused (not dropped) with the members it does have.
/// Then the document is read with the one JSON shape (<see cref="OrchardJson"/>), whose type errors come
/// back all at once, each with its path, the JSON type expected and an enum's allowed values; they are
/// listed beside any refused member, so one answer names every problem. Every problem names its JSON path; the caller stores the re-serialised document.
/// </summary>
public static class DocumentReader
{
    /// <summary>At most this many structural problems are listed (plus one line saying there are more).</summary>
    public const int MaxProblems = 200;

    public static (T? Value, IReadOnlyList<ValidationProblem> Problems) Read<T>(ReadOnlyMemory<byte> utf8)
        where T : class
    {
        var problems = new List<ValidationProblem>();
        var walker = new Walker(problems);
        try
        {
            var reader = new Utf8JsonReader(utf8.Span, new JsonReaderOptions { MaxDepth = OrchardJson.MaxDepth, CommentHandling = JsonCommentHandling.Disallow });
            if (reader.Read())
            {
                walker.Value(ref reader, TypeInfo(typeof(T)), "$");
            }
        }
        catch (JsonException)
        {
            // Broken syntax or too deep: reading it with the JSON shape below says where, with its path.
        }
        catch (TooManyProblems)
        {
            problems.Add(ValidationProblem.Error("$", "problems.tooMany", $"More than {MaxProblems} problems; the first {MaxProblems} are listed."));
        }

        if (!Utf8.IsValid(utf8.Span))
        {
            return (null, problems.Count > 0 ? problems : [ValidationProblem.Error("$", "utf8.invalid", $"The body is not valid UTF-8 (at byte {FirstInvalidByte(utf8.Span)}).")]);
        }

        var parsed = OrchardJson.Parse<T>(Encoding.UTF8.GetString(utf8.Span));
        if (problems.Count == 0)
        {
            return parsed.Succeeded ? (parsed.Value, []) : (null, parsed.Problems);
        }

        // Refused members and wrong JSON types are reported together, so one answer lists every problem.
        return (null, WithTypeProblems(problems, parsed.Problems));
    }

    /// <summary>The structural problems, then what reading found (wrong-typed values, broken syntax) at paths not already named nor inside a refused member, up to the cap.</summary>
    private static List<ValidationProblem> WithTypeProblems(List<ValidationProblem> structural, IReadOnlyList<ValidationProblem> typed)
    {
        if (structural.Exists(p => p.Code == "problems.tooMany"))
        {
            return structural;
        }

        var named = structural.Select(p => p.Path).ToHashSet(StringComparer.Ordinal);
        foreach (var problem in typed.Where(p => !Inside(p.Path, structural) && named.Add(p.Path)))
        {
            if (structural.Count >= MaxProblems)
            {
                structural.Add(ValidationProblem.Error("$", "problems.tooMany", $"More than {MaxProblems} problems; the first {MaxProblems} are listed."));
                break;
            }

            structural.Add(problem);
        }

        return structural;
    }

    /// <summary>Whether <paramref name="path"/> lies within a member already refused (nothing inside it is read).</summary>
    private static bool Inside(string path, List<ValidationProblem> refused) =>
        refused.Exists(r => r.Path != "$" && path.Length > r.Path.Length && path.StartsWith(r.Path, StringComparison.Ordinal) && path[r.Path.Length] is '.' or '[');

    private static JsonTypeInfo? TypeInfo(Type? type)
    {
        if (type is null)
        {
            return null;
        }

        type = Nullable.GetUnderlyingType(type) ?? type;
        return OrchardJson.Options.GetTypeInfo(type);
    }

    private static int FirstInvalidByte(ReadOnlySpan<byte> utf8)
    {
        var valid = 0;
        while (valid < utf8.Length && Rune.DecodeFromUtf8(utf8[valid..], out _, out var consumed) == System.Buffers.OperationStatus.Done)
        {
            valid += consumed;
        }

        return valid;
    }

    private sealed class TooManyProblems : Exception
    {
    }

    /// <summary>Walks the token stream along the document type's shape, noting what the serializer would let through.</summary>
    private sealed class Walker(List<ValidationProblem> problems)
    {
        /// <summary>The reader is on the value's first token; leaves it on the value's last.</summary>
        public void Value(ref Utf8JsonReader reader, JsonTypeInfo? type, string path)
        {
            switch (reader.TokenType)
            {
                case JsonTokenType.StartObject:
                    Members(ref reader, type, path);
                    break;
                case JsonTokenType.StartArray:
                    var element = type?.Kind == JsonTypeInfoKind.Enumerable ? TypeInfo(type.ElementType) : null;
                    for (var index = 0; reader.Read() && reader.TokenType != JsonTokenType.EndArray; index++)
                    {
                        Value(ref reader, element, $"{path}[{index}]");
                    }

                    break;
                case JsonTokenType.String when !Utf8.IsValid(reader.ValueSpan):
                    Add(path, "utf8.invalid", "This text is not valid UTF-8; it is refused rather than stored with characters replaced.");
                    break;
            }
        }

        private void Members(ref Utf8JsonReader reader, JsonTypeInfo? type, string path)
        {
            var seen = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
            var known = type?.Kind == JsonTypeInfoKind.Object ? type.Properties : null;
            var anyName = type?.Kind == JsonTypeInfoKind.Dictionary;
            while (reader.Read() && reader.TokenType != JsonTokenType.EndObject)
            {
                if (!Utf8.IsValid(reader.ValueSpan))
                {
                    Add(path, "utf8.invalid", "A member name here is not valid UTF-8.");
                    reader.Read();
                    reader.Skip();
                    continue;
                }

                string name;
                try
                {
                    name = reader.GetString()!;
                }
                catch (InvalidOperationException)
                {
                    Add(path, "unicode.invalid", "A member name here escapes an unpaired surrogate (not a Unicode character).");
                    reader.Read();
                    reader.Skip();
                    continue;
                }

                var memberPath = path + Segment(name);
                reader.Read();
                if (seen.TryGetValue(name, out var first))
                {
                    Add(memberPath, "member.duplicate", first == name
                        ? $"'{name}' appears twice; each member may appear once."
                        : $"'{name}' appears again (first as '{first}'); members are matched regardless of case, so each may appear once.");
                    reader.Skip();
                    continue;
                }

                seen[name] = name;
                JsonTypeInfo? memberType = null;
                if (known is not null)
                {
                    var property = known.FirstOrDefault(p => string.Equals(p.Name, name, StringComparison.OrdinalIgnoreCase));
                    if (property is null)
                    {
                        Add(memberPath, "member.unknown", $"'{name}' is not a member here (members are refused, not dropped, so nothing unread is stored); expected {string.Join(", ", known.Select(p => p.Name))}.");
                        reader.Skip();
                        continue;
                    }

                    memberType = TypeInfo(property.PropertyType);
                }
                else if (anyName)
                {
                    memberType = TypeInfo(type!.ElementType);
                }

                Value(ref reader, memberType, memberPath);
            }
        }

        private void Add(string path, string code, string message)
        {
            if (problems.Count >= MaxProblems)
            {
                throw new TooManyProblems();
            }

            problems.Add(ValidationProblem.Error(path, code, message));
        }

        private static string Segment(string name) =>
            name.Length > 0 && (char.IsAsciiLetter(name[0]) || name[0] == '_') && name.All(c => char.IsAsciiLetterOrDigit(c) || c == '_')
                ? "." + name
                : "['" + Escape(name) + "']";

        private static string Escape(string name)
        {
            var text = new StringBuilder();
            foreach (var c in name.Length > 64 ? name[..64] : name)
            {
                text.Append(c is >= ' ' and <= '~' && c is not '\'' and not '\\' ? c.ToString() : $"\\u{(int)c:X4}");
            }

            return text.ToString();
        }
    }
}
