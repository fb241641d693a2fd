using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Serialization.Metadata;
using Orchard.Core.Validation;

namespace Orchard.Core.Serialization;

/// <summary>
/// Walks a syntactically valid JSON document against the shape the serializer expects for a type (its
/// <see cref="JsonTypeInfo"/> under <see cref="OrchardJson.Options"/>) and reports every value of the
/// wrong JSON type at once: its JSON path, the JSON type expected (for an enum, the values allowed) and
/// what was found, in JSON's words, never .NET's. Used only after reading has failed, so a good document
/// costs nothing extra. Members the type does not know are skipped, as the reader skips them; a null
/// where a reference is expected is left to validation (<c>field.missing</c>).
/// </summary>
internal sealed class JsonShapeChecker
{
    private readonly JsonSerializerOptions _options;
    private readonly ProblemCollector _problems = new();
    private readonly Dictionary<Type, string[]> _enumNames = [];

    private JsonShapeChecker(JsonSerializerOptions options) => _options = options;

    /// <summary>Every wrong-typed value in <paramref name="root"/> for type <paramref name="type"/> (up to the usual cap).</summary>
    public static IReadOnlyList<ValidationProblem> Check(JsonElement root, Type type, JsonSerializerOptions options)
    {
        var checker = new JsonShapeChecker(options);
        checker.Walk(root, type, "$");
        return checker._problems.ToReport().Problems;
    }

    private void Walk(JsonElement element, Type type, string path)
    {
        if (Nullable.GetUnderlyingType(type) is { } underlying)
        {
            if (element.ValueKind != JsonValueKind.Null)
            {
                Walk(element, underlying, path);
            }

            return;
        }

        if (element.ValueKind == JsonValueKind.Null)
        {
            if (type.IsValueType)
            {
                Wrong(path, Expected(type), element);
            }

            return;
        }

        if (type.IsEnum)
        {
            CheckEnum(element, type, path);
            return;
        }

        if (CheckPrimitive(element, type) is { } handled)
        {
            if (!handled)
            {
                Wrong(path, element.ValueKind == JsonValueKind.Number && Expected(type) == "a number" ? "a finite number within the range of a 64-bit float" : Expected(type), element);
            }

            return;
        }

        var info = _options.GetTypeInfo(type);
        switch (info.Kind)
        {
            case JsonTypeInfoKind.Object:
                if (element.ValueKind != JsonValueKind.Object)
                {
                    Wrong(path, "an object", element);
                    return;
                }

                foreach (var member in element.EnumerateObject())
                {
                    var property = Find(info, member.Name);
                    if (property is not null)
                    {
                        Walk(member.Value, property.PropertyType, Member(path, member.Name));
                    }
                }

                return;
            case JsonTypeInfoKind.Enumerable:
                if (element.ValueKind != JsonValueKind.Array)
                {
                    Wrong(path, $"an array of {Expected(info.ElementType!)}", element);
                    return;
                }

                var index = 0;
                foreach (var item in element.EnumerateArray())
                {
                    Walk(item, info.ElementType!, $"{path}[{index++}]");
                }

                return;
            case JsonTypeInfoKind.Dictionary:
                if (element.ValueKind != JsonValueKind.Object)
                {
                    Wrong(path, "an object", element);
                    return;
                }

                foreach (var member in element.EnumerateObject())
                {
                    Walk(member.Value, info.ElementType!, Member(path, member.Name));
                }

                return;
            default:
                // A type with a converter of its own: its reader is the judge.
                if (!Reads(element, type))
                {
                    Wrong(path, Expected(type), element);
                }

                return;
        }
    }

    /// <summary>True or false for the JSON primitives this checker knows; null for anything else.</summary>
    private static bool? CheckPrimitive(JsonElement element, Type type)
    {
        if (type == typeof(string))
        {
            return element.ValueKind == JsonValueKind.String;
        }

        if (type == typeof(bool))
        {
            return element.ValueKind is JsonValueKind.True or JsonValueKind.False;
        }

        if (type == typeof(double) || type == typeof(float) || type == typeof(decimal))
        {
            return element.ValueKind == JsonValueKind.Number
                && (type == typeof(decimal) ? element.TryGetDecimal(out _) : element.TryGetDouble(out var d) && double.IsFinite(d));
        }

        if (type == typeof(int))
        {
            return element.ValueKind == JsonValueKind.Number && element.TryGetInt32(out _);
        }

        if (type == typeof(long))
        {
            return element.ValueKind == JsonValueKind.Number && element.TryGetInt64(out _);
        }

        if (type == typeof(DateTimeOffset))
        {
            return element.ValueKind == JsonValueKind.String && element.TryGetDateTimeOffset(out _);
        }

        if (type == typeof(DateTime))
        {
            return element.ValueKind == JsonValueKind.String && element.TryGetDateTime(out _);
        }

        if (type == typeof(Guid))
        {
            return element.ValueKind == JsonValueKind.String && element.TryGetGuid(out _);
        }

        return null;
    }

    private void CheckEnum(JsonElement element, Type type, string path)
    {
        if (element.ValueKind == JsonValueKind.String && Reads(element, type))
        {
            return;
        }

        var names = EnumNames(type);
        var found = Describe(element);
        _problems.Error(
            path,
            element.ValueKind == JsonValueKind.String ? "json.enum" : "json.type",
            $"Expected a string, one of {string.Join(", ", names.Select(n => "\"" + n + "\""))}; found {found}.");
    }

    private string[] EnumNames(Type type)
    {
        if (!_enumNames.TryGetValue(type, out var names))
        {
            // The names as the serializer writes them (member-name attributes, naming policy), in declaration order.
            names = Enum.GetValues(type).Cast<object>().Select(v => JsonSerializer.Serialize(v, type, _options).Trim('"')).ToArray();
            _enumNames[type] = names;
        }

        return names;
    }

    private bool Reads(JsonElement element, Type type)
    {
        try
        {
            _ = element.Deserialize(type, _options);
            return true;
        }
        catch (Exception ex) when (ex is JsonException or NotSupportedException or InvalidOperationException or FormatException or OverflowException)
        {
            return false;
        }
    }

    private JsonPropertyInfo? Find(JsonTypeInfo info, string name)
    {
        var comparison = _options.PropertyNameCaseInsensitive ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal;
        foreach (var property in info.Properties)
        {
            if (string.Equals(property.Name, name, comparison))
            {
                return property;
            }
        }

        return null;
    }

    private void Wrong(string path, string expected, JsonElement found) =>
        _problems.Error(path, "json.type", $"Expected {expected}; found {Describe(found)}.");

    /// <summary>The JSON type a .NET type is read from, in JSON's words.</summary>
    private string Expected(Type type)
    {
        if (Nullable.GetUnderlyingType(type) is { } underlying)
        {
            return Expected(underlying) + " or null";
        }

        if (type.IsEnum)
        {
            return "a string, one of " + string.Join(", ", EnumNames(type).Select(n => "\"" + n + "\""));
        }

        if (type == typeof(string))
        {
            return "a string";
        }

        if (type == typeof(bool))
        {
            return "true or false";
        }

        if (type == typeof(double) || type == typeof(float) || type == typeof(decimal))
        {
            return "a number";
        }

        if (type == typeof(int))
        {
            return $"a whole number (integer from {int.MinValue.ToString(CultureInfo.InvariantCulture)} to {int.MaxValue.ToString(CultureInfo.InvariantCulture)})";
        }

        if (type == typeof(long))
        {
            return "a whole number (integer)";
        }

        if (type == typeof(DateTimeOffset) || type == typeof(DateTime))
        {
            return "a date-time string (RFC 3339, e.g. \"2026-01-20T09:30:00Z\")";
        }

        if (type == typeof(Guid))
        {
            return "a UUID string";
        }

        return _options.GetTypeInfo(type).Kind switch
        {
            JsonTypeInfoKind.Object or JsonTypeInfoKind.Dictionary => "an object",
            JsonTypeInfoKind.Enumerable => "an array",
            _ => "a value of this field's documented form",
        };
    }

    /// <summary>What the document holds, in JSON's words, with a short excerpt of the value.</summary>
    private static string Describe(JsonElement element) => element.ValueKind switch
    {
        JsonValueKind.String => $"the string {Excerpt(element.GetRawText())}",
        JsonValueKind.Number => $"the number {Excerpt(element.GetRawText())}",
        JsonValueKind.True => "true",
        JsonValueKind.False => "false",
        JsonValueKind.Null => "null",
        JsonValueKind.Array => "an array",
        JsonValueKind.Object => "an object",
        _ => "nothing",
    };

    private static string Excerpt(string raw) => raw.Length <= 40 ? raw : raw[..37] + "…";

    private static string Member(string path, string name)
    {
        if (name.Length > 0 && (char.IsLetter(name[0]) || name[0] == '_') && name.All(c => char.IsLetterOrDigit(c) || c == '_'))
        {
            return path + "." + name;
        }

        var quoted = new StringBuilder(path).Append("['");
        foreach (var c in name)
        {
            quoted.Append(c is '\'' or '\\' ? "\\" + c : c.ToString());
        }

        return quoted.Append("']").ToString();
    }
}
