using System.Diagnostics.CodeAnalysis;

namespace CopyNumber.Randomness;

/// <summary>
/// Binomial variates, e.g. to bound the firings of a channel by the molecules available to it. With
/// p ≤ ½ (the law is mirrored for p &gt; ½): n·p below 10 by inversion, otherwise the transformed
/// rejection method with squeeze, BTRS, of Hörmann (1993, "The generation of binomial random variates",
/// Journal of Statistical Computation and Simulation 46:101–110), with its acceptance test on the
/// saddle-point log-probability of <see cref="SaddlePointExpansion"/>. Nothing is allocated.
/// </summary>
public static class BinomialSampler
{
    /// <summary>The largest accepted number of trials, 2^52, so every count is exact in a double.</summary>
    public const long MaxTrials = 1L << 52;

    /// <summary>Below this n·min(p, 1 − p) inversion is used, at and above it BTRS.</summary>
    internal const double RejectionThreshold = 10.0;

    /// <summary>
    /// The number of successes in <paramref name="trials"/> independent trials each succeeding with
    /// <paramref name="probability"/>. n = 0, p = 0 and p = 1 return at once without drawing.
    /// </summary>
    /// <param name="rng">The generator, advanced in place.</param>
    /// <param name="trials">n, 0 ≤ n ≤ <see cref="MaxTrials"/>.</param>
    /// <param name="probability">p, 0 ≤ p ≤ 1.</param>
    /// <exception cref="ArgumentOutOfRangeException">n or p is outside its range (or p is NaN).</exception>
    public static long Sample(ref Xoshiro256StarStar rng, long trials, double probability)
    {
        if (trials < 0 || trials > MaxTrials) ThrowBadTrials(trials);
        if (!(probability >= 0.0 && probability <= 1.0)) ThrowBadProbability(probability);
        if (trials == 0 || probability == 0.0) return 0;
        if (probability == 1.0) return trials;
        // For p > ½, 1 − p is exact (Sterbenz), so the mirrored law loses nothing.
        var mirrored = probability > 0.5;
        var p = mirrored ? 1.0 - probability : probability;
        var q = mirrored ? probability : 1.0 - probability;
        double n = trials;
        var successes = n * p < RejectionThreshold ? SampleByInversion(ref rng, n, p, q) : SampleByTransformedRejection(ref rng, n, p, q);
        return mirrored ? trials - successes : successes;
    }

    /// <summary>
    /// The smallest x with u &lt; F(x), the terms b(x) = b(x − 1)·((n + 1)/x − 1)·p/q summed upward from
    /// b(0) = qⁿ; a u left above the rounded total is drawn again, as in <see cref="PoissonSampler"/>.
    /// </summary>
    private static long SampleByInversion(ref Xoshiro256StarStar rng, double n, double p, double q)
    {
        var first = Math.Exp(n * SaddlePointExpansion.LogOnePlus(-p));
        var ratio = p / q;
        var scaled = (n + 1) * ratio;
        while (true)
        {
            var u = rng.NextDouble();
            var term = first;
            var cumulative = first;
            var x = 0L;
            while (u >= cumulative && term > 0.0 && x < n)
            {
                x++;
                term *= scaled / x - ratio;
                cumulative += term;
            }
            if (u < cumulative) return x;
        }
    }

    /// <summary>Hörmann's BTRS with his constants; the acceptance test compares against b(k)/b(mode).</summary>
    private static long SampleByTransformedRejection(ref Xoshiro256StarStar rng, double n, double p, double q)
    {
        var spread = Math.Sqrt(n * p * q);
        var b = 1.15 + 2.53 * spread;
        var a = -0.0873 + 0.0248 * b + 0.01 * p;
        var c = n * p + 0.5;
        var squeezeLimit = 0.92 - 4.2 / b;
        var alpha = (2.83 + 5.1 / b) * spread;
        var mode = Math.Floor((n + 1) * p);
        var logAtMode = SaddlePointExpansion.LogBinomialProbability(mode, n, p, q);
        while (true)
        {
            var u = rng.NextDouble() - 0.5;
            var v = rng.NextDouble();
            var us = 0.5 - Math.Abs(u);
            var k = Math.Floor((2.0 * a / us + b) * u + c);
            if (!(k >= 0.0) || k > n) continue;
            if (us >= 0.07 && v <= squeezeLimit) return (long)k;
            if (Math.Log(v * alpha / (a / (us * us) + b)) <= SaddlePointExpansion.LogBinomialProbability(k, n, p, q) - logAtMode)
                return (long)k;
        }
    }

    [DoesNotReturn]
    private static void ThrowBadTrials(long trials) =>
        throw new ArgumentOutOfRangeException(nameof(trials), trials, $"a binomial trial count must be between 0 and {MaxTrials}");

    [DoesNotReturn]
    private static void ThrowBadProbability(double probability) =>
        throw new ArgumentOutOfRangeException(nameof(probability), probability, "a binomial success probability must be a number between 0 and 1");
}
