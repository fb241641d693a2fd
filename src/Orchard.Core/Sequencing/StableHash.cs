namespace Orchard.Core.Sequencing;

/// <summary>FNV-1a, 64 bit: a hash fixed by this code (string.GetHashCode is randomised per process).</summary>
internal static class StableHash
{
    public static ulong Of(ulong seed, params string[] parts)
    {
        var h = 14695981039346656037UL ^ seed;
        foreach (var part in parts)
        {
            foreach (var c in part)
            {
                h = (h ^ c) * 1099511628211UL;
            }

            h = (h ^ 0xFF) * 1099511628211UL;
        }

        return h;
    }

    public static ulong Of(ReadOnlySpan<double> values)
    {
        var h = 14695981039346656037UL;
        foreach (var v in values)
        {
            var bits = (ulong)BitConverter.DoubleToInt64Bits(Math.Round(v, 9));
            for (var i = 0; i < 8; i++)
            {
                h = (h ^ ((bits >> (8 * i)) & 0xFF)) * 1099511628211UL;
            }
        }

        return h;
    }
}
