using System.Globalization;

namespace Orchard.Service.Cli;

/// <summary>
/// The words after a verb: positional values and <c>--name value</c> options. Unknown options and
/// malformed values are reported as <see cref="UsageException"/>, never as a crash.
/// </summary>
internal sealed class CliArguments
{
    private readonly Dictionary<string, string?> _options = new(StringComparer.Ordinal);
    private readonly HashSet<string> _read = new(StringComparer.Ordinal);

    public CliArguments(IEnumerable<string> words, IReadOnlySet<string> flags)
    {
        var list = words.ToList();
        for (var i = 0; i < list.Count; i++)
        {
            var word = list[i];
            if (!word.StartsWith("--", StringComparison.Ordinal) || word.Length == 2)
            {
                Positional.Add(word);
                continue;
            }

            var name = word[2..];
            string? value = null;
            var eq = name.IndexOf('=', StringComparison.Ordinal);
            if (eq >= 0)
            {
                value = name[(eq + 1)..];
                name = name[..eq];
            }
            else if (!flags.Contains(name))
            {
                if (i + 1 >= list.Count)
                {
                    throw new UsageException($"--{name} needs a value.");
                }

                value = list[++i];
            }

            if (!_options.TryAdd(name, value))
            {
                throw new UsageException($"--{name} is given twice.");
            }
        }
    }

    public List<string> Positional { get; } = [];

    public bool Flag(string name)
    {
        _read.Add(name);
        return _options.ContainsKey(name);
    }

    public string? Text(string name)
    {
        _read.Add(name);
        return _options.TryGetValue(name, out var value) ? value : null;
    }

    public int Int(string name, int fallback, int min, int max)
    {
        var text = Text(name);
        if (text is null)
        {
            return fallback;
        }

        if (!int.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out var value) || value < min || value > max)
        {
            throw new UsageException($"--{name} takes a whole number from {min} to {max}; got '{text}'.");
        }

        return value;
    }

    public double Double(string name, double fallback, double min, double max)
    {
        var text = Text(name);
        if (text is null)
        {
            return fallback;
        }

        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !(value >= min && value <= max))
        {
            throw new UsageException($"--{name} takes a number from {min} to {max}; got '{text}'.");
        }

        return value;
    }

    public ulong UInt64(string name, ulong fallback)
    {
        var text = Text(name);
        if (text is null)
        {
            return fallback;
        }

        return ulong.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out var value)
            ? value
            : throw new UsageException($"--{name} takes a non-negative whole number; got '{text}'.");
    }

    /// <summary>Call after reading every option a verb knows: anything left over is a mistake.</summary>
    public void RejectUnknown()
    {
        var unknown = _options.Keys.Where(k => !_read.Contains(k)).Order(StringComparer.Ordinal).ToList();
        if (unknown.Count > 0)
        {
            throw new UsageException($"Unknown option{(unknown.Count > 1 ? "s" : string.Empty)}: {string.Join(", ", unknown.Select(u => "--" + u))}.");
        }
    }
}
