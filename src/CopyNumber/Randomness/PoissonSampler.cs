using System.Diagnostics.CodeAnalysis;
using System.Runtime.CompilerServices;

namespace CopyNumber.Randomness;

/// <summary>
/// Poisson variates for tau-leaping. Means below 10 are drawn by inversion (one uniform, a sequential
/// search from 0); larger means by the transformed rejection method with squeeze, PTRS, of Hörmann
/// (1993, "The transformed rejection method for generating Poisson random variables", Insurance:
/// Mathematics and Economics 12:39–45): two uniforms a trial and most trials accepted, whatever the mean.
/// The acceptance test of PTRS uses the saddle-point form of the log-probability
/// (<see cref="SaddlePointExpansion"/>) rather than k·log μ − μ − log Γ(k + 1), which keeps it accurate
/// for means up to <see cref="MaxMean"/>. Nothing is allocated.
/// </summary>
public static class PoissonSampler
{
    /// <summary>
    /// The largest accepted mean, 2^52 ≈ 4.5·10^15: up to here a double holds μ + 0.43 to better than
    /// 0.5, so the rounding in PTRS's k = ⌊…+ μ + 0.43⌋ stays below one count, and every variate is an
    /// integer exactly representable in both a double and a long.
    /// </summary>
    public const double MaxMean = 4503599627370496.0;

    /// <summary>Below this mean inversion is used, at and above it PTRS (Hörmann's own switch point).</summary>
    internal const double RejectionThreshold = 10.0;

    /// <summary>
    /// A Poisson variate with mean <paramref name="mean"/>, 0 ≤ mean ≤ <see cref="MaxMean"/>. A mean of 0
    /// returns 0 without drawing from <paramref name="rng"/>; a mean below 10 normally takes one draw
    /// (inversion), a larger one two draws per rejection trial (PTRS).
    /// </summary>
    /// <exception cref="ArgumentOutOfRangeException">The mean is negative, NaN or above <see cref="MaxMean"/>.</exception>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static long Sample(ref Xoshiro256StarStar rng, double mean)
    {
        if (!(mean >= 0.0 && mean <= MaxMean)) ThrowBadMean(mean);
        if (mean == 0.0) return 0;
        return mean < RejectionThreshold ? SampleByInversion(ref rng, mean) : SampleByTransformedRejection(ref rng, mean);
    }

    /// <summary>
    /// Returns the smallest k with u &lt; F(k), F the Poisson distribution function, summed upward from
    /// F(0) = e^{−μ}. Rounding can leave the summed F just short of 1; a u above it (probability of
    /// order 10^-16) is discarded and drawn again once the terms underflow, rather than mapped to an
    /// arbitrary large k.
    /// </summary>
    private static long SampleByInversion(ref Xoshiro256StarStar rng, double mean)
    {
        var first = Math.Exp(-mean);
        while (true)
        {
            var u = rng.NextDouble();
            var term = first;
            var cumulative = first;
            var k = 0L;
            while (u >= cumulative && term > 0.0)
            {
                k++;
                term *= mean / k;
                cumulative += term;
            }
            if (u < cumulative) return k;
        }
    }

    /// <summary>Hörmann's PTRS, steps 1–3 of his algorithm, with his constants.</summary>
    private static long SampleByTransformedRejection(ref Xoshiro256StarStar rng, double mean)
    {
        var b = 0.931 + 2.53 * Math.Sqrt(mean);
        var a = -0.059 + 0.02483 * b;
        var inverseAlpha = 1.1239 + 1.1328 / (b - 3.4);
        var squeezeLimit = 0.9277 - 3.6224 / (b - 2.0);
        while (true)
        {
            var u = rng.NextDouble() - 0.5;
            var v = rng.NextDouble();
            var us = 0.5 - Math.Abs(u);
            // u = −0.5 gives us = 0 and k = −∞, rejected below before any conversion to long.
            var k = Math.Floor((2.0 * a / us + b) * u + mean + 0.43);
            if (us >= 0.07 && v <= squeezeLimit) return (long)k;
            if (!(k >= 0.0) || (us < 0.013 && v > us)) continue;
            // Far tails beyond 2^62 have probability far below 2^-1000 for any mean allowed here.
            if (k > 4.6e18) continue;
            if (Math.Log(v * inverseAlpha / (a / (us * us) + b)) <= SaddlePointExpansion.LogPoissonProbability(k, mean))
                return (long)k;
        }
    }

    [DoesNotReturn]
    private static void ThrowBadMean(double mean) =>
        throw new ArgumentOutOfRangeException(nameof(mean), mean,
            $"a Poisson mean must be a number between 0 and {MaxMean:E3}");
}
