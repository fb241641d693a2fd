namespace Orchard.Core.Randomness;

/// <summary>
/// A seeded pseudo-random source whose sequence is fixed by this code, not by the runtime:
/// xoshiro256** (Blackman and Vigna, "Scrambled Linear Pseudorandom Number Generators",
/// ACM TOMS 47(4), 2021), seeded through SplitMix64 as its authors recommend. Not thread-safe:
/// give each worker its own instance (see <see cref="Fork"/>).
/// </summary>
public sealed class DeterministicRandom
{
    private ulong _s0;
    private ulong _s1;
    private ulong _s2;
    private ulong _s3;
    private double? _spareGaussian;

    public DeterministicRandom(ulong seed)
    {
        var x = seed;
        _s0 = SplitMix64(ref x);
        _s1 = SplitMix64(ref x);
        _s2 = SplitMix64(ref x);
        _s3 = SplitMix64(ref x);
    }

    /// <summary>A new independent source derived from this seed and a stream number, e.g. a tree index.</summary>
    public static DeterministicRandom ForStream(ulong seed, ulong stream)
    {
        var x = seed ^ (0x9E3779B97F4A7C15UL * (stream + 1));
        return new DeterministicRandom(SplitMix64(ref x));
    }

    /// <summary>A new source seeded from this one's next output.</summary>
    public DeterministicRandom Fork() => new(NextUInt64());

    public ulong NextUInt64()
    {
        var result = RotateLeft(_s1 * 5, 7) * 9;
        var t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>Uniform in [0, 1), 53 random bits.</summary>
    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Uniform in [min, max).</summary>
    public double NextDouble(double min, double max) => min + ((max - min) * NextDouble());

    /// <summary>Uniform integer in [0, exclusiveMax), without modulo bias (Lemire's method).</summary>
    public int NextInt(int exclusiveMax)
    {
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(exclusiveMax);
        var bound = (ulong)exclusiveMax;
        var threshold = (0UL - bound) % bound;
        while (true)
        {
            var r = NextUInt64();
            var product = Math.BigMul(r, bound, out var low);
            if (low >= threshold)
            {
                return (int)product;
            }
        }
    }

    /// <summary>Uniform integer in [min, exclusiveMax).</summary>
    public int NextInt(int min, int exclusiveMax) => min + NextInt(exclusiveMax - min);

    public bool NextBool(double probabilityTrue) => NextDouble() < probabilityTrue;

    /// <summary>Standard normal deviate (Marsaglia's polar method; the pair's second value is kept for the next call).</summary>
    public double NextGaussian()
    {
        if (_spareGaussian is { } spare)
        {
            _spareGaussian = null;
            return spare;
        }

        double u, v, s;
        do
        {
            u = (2 * NextDouble()) - 1;
            v = (2 * NextDouble()) - 1;
            s = (u * u) + (v * v);
        }
        while (s >= 1 || s == 0);

        var factor = Math.Sqrt(-2 * Math.Log(s) / s);
        _spareGaussian = v * factor;
        return u * factor;
    }

    private static ulong RotateLeft(ulong x, int k) => (x << k) | (x >> (64 - k));

    private static ulong SplitMix64(ref ulong x)
    {
        x += 0x9E3779B97F4A7C15UL;
        var z = x;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }
}
