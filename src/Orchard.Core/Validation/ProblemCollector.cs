namespace Orchard.Core.Validation;

/// <summary>Gathers problems while a validator walks a document; checks that read as one line each.</summary>
internal sealed class ProblemCollector
{
    /// <summary>A hostile document can hold millions of faults; past this many, one summary problem stands for the rest.</summary>
    public const int MaxReported = 200;

    private readonly List<ValidationProblem> _problems = [];
    private int _suppressedErrors;
    private int _suppressedWarnings;

    public int ErrorCount { get; private set; }

    public void Error(string path, string code, string message)
    {
        ErrorCount++;
        if (_problems.Count < MaxReported)
        {
            _problems.Add(ValidationProblem.Error(path, code, message));
        }
        else
        {
            _suppressedErrors++;
        }
    }

    public void Warning(string path, string code, string message)
    {
        if (_problems.Count < MaxReported)
        {
            _problems.Add(ValidationProblem.Warning(path, code, message));
        }
        else
        {
            _suppressedWarnings++;
        }
    }

    /// <summary>Reports a missing value; true when it is there.</summary>
    public bool Present(object? value, string path)
    {
        if (value is null)
        {
            Error(path, "field.missing", "This field is required.");
            return false;
        }

        return true;
    }

    /// <summary>Reports a non-finite number; true when it is finite.</summary>
    public bool Finite(double value, string path)
    {
        if (!double.IsFinite(value))
        {
            Error(path, "number.notFinite", "Must be a finite number.");
            return false;
        }

        return true;
    }

    /// <summary>Reports a non-finite or out-of-range number; true when it is fine.</summary>
    public bool InRange(double value, double min, double max, string path, string code, string what)
    {
        if (!Finite(value, path))
        {
            return false;
        }

        if (value < min || value > max)
        {
            Error(path, code, $"{what} must be between {min:G} and {max:G}; it is {value:G}.");
            return false;
        }

        return true;
    }

    /// <summary>Reports a number that is not finite or not strictly positive (up to a maximum).</summary>
    public bool Positive(double value, double max, string path, string code, string what)
    {
        if (!Finite(value, path))
        {
            return false;
        }

        if (value <= 0)
        {
            Error(path, code, $"{what} must be greater than 0; it is {value:G}.");
            return false;
        }

        if (value > max)
        {
            Error(path, code, $"{what} must be at most {max:G}; it is {value:G}.");
            return false;
        }

        return true;
    }

    /// <summary>Reports a missing, blank or over-long identifier, or one off <see cref="IdPattern"/>; true when it is usable.</summary>
    public bool Identifier(string? value, int maxLength, string path)
    {
        if (value is null)
        {
            Error(path, "field.missing", "This field is required.");
            return false;
        }

        if (value.Length == 0)
        {
            Error(path, "id.blank", "Must not be empty. " + IdPattern.Message);
            return false;
        }

        if (value.Length > maxLength)
        {
            Error(path, "id.tooLong", $"Must be at most {maxLength} characters; it has {value.Length}.");
            return false;
        }

        if (!IdPattern.IsValid(value))
        {
            Error(path, "id.pattern", $"'{Printable(value!)}' is not an id. {IdPattern.Message}");
            return false;
        }

        return true;
    }

    /// <summary>
    /// Reports a missing, blank, over-long or padded name shown to people (a block, a row), or one with
    /// control or invisible formatting characters (bidi overrides, zero-width spaces); true when it is usable.
    /// </summary>
    public bool Label(string? value, int maxLength, string path)
    {
        if (value is null)
        {
            Error(path, "field.missing", "This field is required.");
            return false;
        }

        if (string.IsNullOrWhiteSpace(value))
        {
            Error(path, "id.blank", "Must not be empty.");
            return false;
        }

        if (value.Length > maxLength)
        {
            Error(path, "id.tooLong", $"Must be at most {maxLength} characters; it has {value.Length}.");
            return false;
        }

        if (value.Any(char.IsControl))
        {
            Error(path, "id.controlCharacter", "Must not contain control characters.");
            return false;
        }

        if (value.Any(c => char.GetUnicodeCategory(c) == System.Globalization.UnicodeCategory.Format))
        {
            Error(path, "id.formatCharacter", "Must not contain invisible formatting characters (bidi overrides, zero-width spaces).");
            return false;
        }

        if (char.IsWhiteSpace(value[0]) || char.IsWhiteSpace(value[^1]))
        {
            Error(path, "id.padded", "Must not begin or end with spaces.");
            return false;
        }

        return true;
    }

    /// <summary>The value with anything unprintable shown as \uXXXX, cut to 80 characters, for messages.</summary>
    private static string Printable(string value)
    {
        var text = new System.Text.StringBuilder();
        foreach (var c in value.Length > 80 ? value[..80] : value)
        {
            text.Append(c is >= ' ' and <= '~' && c is not '\\' and not '\'' ? c.ToString() : $"\\u{(int)c:X4}");
        }

        return text.ToString();
    }

    public bool Vector(Model.Vector3M? value, double maxAbs, string path)
    {
        if (!Present(value, path))
        {
            return false;
        }

        var ok = InRange(value!.X, -maxAbs, maxAbs, path + ".x", "coordinate.outOfRange", "A coordinate");
        ok &= InRange(value.Y, -maxAbs, maxAbs, path + ".y", "coordinate.outOfRange", "A coordinate");
        ok &= InRange(value.Z, -maxAbs, maxAbs, path + ".z", "coordinate.outOfRange", "A coordinate");
        return ok;
    }

    public ValidationReport ToReport()
    {
        var problems = new List<ValidationProblem>(_problems);
        if (_suppressedErrors > 0)
        {
            problems.Add(ValidationProblem.Error("$", "problems.truncated", $"{_suppressedErrors} more errors are not listed; fix the ones above first."));
        }

        if (_suppressedWarnings > 0)
        {
            problems.Add(ValidationProblem.Warning("$", "problems.truncated", $"{_suppressedWarnings} more warnings are not listed."));
        }

        return new ValidationReport(problems);
    }
}
