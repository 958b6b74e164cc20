using System.Numerics;
using System.Runtime.CompilerServices;

namespace CopyNumber.Randomness;

/// <summary>
/// The xoshiro256** generator of Blackman &amp; Vigna (2021, ACM Trans. Math. Softw. 47(4):36): 256 bits of
/// state, period 2^256 − 1, fast and statistically strong. A mutable struct held by value inside each
/// simulator, so drawing a number touches no heap and no shared state.
/// </summary>
public struct Xoshiro256StarStar
{
    private ulong _s0, _s1, _s2, _s3;

    /// <summary>
    /// Seeds the state from one 64-bit value by four outputs of SplitMix64, as the generator's authors
    /// recommend; SplitMix64 never yields the all-zero state from four consecutive outputs.
    /// </summary>
    public Xoshiro256StarStar(ulong seed)
    {
        var x = seed;
        _s0 = SplitMix64(ref x);
        _s1 = SplitMix64(ref x);
        _s2 = SplitMix64(ref x);
        _s3 = SplitMix64(ref x);
    }

    /// <summary>
    /// A generator in the given raw state, so that tests can start from the states published with the
    /// algorithm. The all-zero state is a fixed point and is refused.
    /// </summary>
    internal Xoshiro256StarStar(ulong s0, ulong s1, ulong s2, ulong s3)
    {
        if ((s0 | s1 | s2 | s3) == 0) throw new ArgumentException("the all-zero state of xoshiro256** never leaves zero");
        _s0 = s0;
        _s1 = s1;
        _s2 = s2;
        _s3 = s3;
    }

    /// <summary>The next 64 random bits.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public ulong NextUInt64()
    {
        var result = BitOperations.RotateLeft(_s1 * 5, 7) * 9;
        var t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = BitOperations.RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>A uniform double in [0, 1) with 53 random bits.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    /// <summary>A uniform double in (0, 1], safe to pass to <see cref="Math.Log(double)"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double NextOpenDouble() => ((NextUInt64() >> 11) + 1) * (1.0 / (1UL << 53));

    /// <summary>
    /// An exponential variate with rate 1 (mean 1), exact, by the ziggurat method
    /// (<see cref="ZigguratExponential"/>): usually one 64-bit draw, a multiply and a compare.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double NextExponential() => ZigguratExponential.Sample(NextUInt64(), ref this);

    /// <summary>One step of SplitMix64 (Steele, Lea &amp; Flood 2014, OOPSLA), used for seeding and stream derivation.</summary>
    public static ulong SplitMix64(ref ulong state)
    {
        var z = state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }
}
