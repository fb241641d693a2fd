namespace Orchard.Core.Validation;

/// <summary>
/// The one pattern every id follows (trees, nodes, branches, cuts, obstacles, arm profiles and their joints,
/// and ids in URLs): ASCII letters and digits, '-', '_' and '.', 1 to 64 characters, not dots alone.
/// Being ASCII, an id is always in Unicode NFC, and look-alikes cannot pass: no spaces, no bidi or
/// zero-width characters, no decomposed letters, no '/' or '%' that would alias another address, and no
/// "." or ".." that a client would resolve away as a path segment.
/// </summary>
public static class IdPattern
{
    public const int MaxLength = 64;

    /// <summary>The pattern as a regular expression, for messages and documentation.</summary>
    public const string Expression = "^[A-Za-z0-9._-]{1,64}$ (not dots alone)";

    /// <summary>The message every refused id gets.</summary>
    public const string Message = "Ids must match " + Expression + ": ASCII letters and digits, '-', '_' and '.', 1 to 64 characters.";

    public static bool IsValid(string? id)
    {
        if (id is null || id.Length is 0 or > MaxLength)
        {
            return false;
        }

        var dotsOnly = true;
        foreach (var c in id)
        {
            if (!(char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or '.'))
            {
                return false;
            }

            dotsOnly &= c == '.';
        }

        return !dotsOnly;
    }
}
