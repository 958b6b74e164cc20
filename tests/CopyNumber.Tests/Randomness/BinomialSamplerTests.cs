using CopyNumber.Randomness;
using MathNet.Numerics;

namespace CopyNumber.Tests.Randomness;

public class BinomialSamplerTests
{
    private const int Draws = 200_000;

    /// <summary>The binomial pmf C(n, k)pᵏ(1 − p)ⁿ⁻ᵏ from its definition, in logs, with MathNet's log-gamma.</summary>
    private static double BinomialProbability(long k, long n, double p) =>
        Math.Exp(SpecialFunctions.GammaLn(n + 1.0) - SpecialFunctions.GammaLn(k + 1.0) - SpecialFunctions.GammaLn(n - k + 1.0)
            + k * Math.Log(p) + (n - k) * Math.Log(1 - p));

    [Theory]
    [InlineData(5L, 0.7)]               // mirrored, inversion
    [InlineData(20L, 0.3)]              // inversion
    [InlineData(1000L, 0.25)]           // BTRS
    [InlineData(200L, 0.9)]             // mirrored, BTRS
    [InlineData(1_000_000L, 0.5)]       // BTRS, wide
    [InlineData(1_000_000_000L, 3e-9)]  // inversion with a huge n
    public void Draws_fit_the_exact_binomial_law(long n, double p)
    {
        var rng = new Xoshiro256StarStar(4242 + (ulong)n);
        var draws = new long[Draws];
        for (var i = 0; i < Draws; i++) draws[i] = BinomialSampler.Sample(ref rng, n, p);

        var mean = n * p;
        var variance = n * p * (1 - p);
        var spread = 15 * Math.Sqrt(variance) + 30;
        var low = (long)Math.Max(0, Math.Floor(mean - spread));
        var high = (long)Math.Min(n, Math.Ceiling(mean + spread));
        var pValue = ChiSquareTest.PValue(draws, k => BinomialProbability(k, n, p), low, high);
        Assert.True(pValue > ChiSquareTest.Level, $"chi-square p-value {pValue:E3} for n = {n}, p = {p}");

        // Binomial fourth central moment npq(1 + 3pq(n − 2)) (textbook), giving the sample variance's
        // standard error √((μ₄ − σ⁴)/N). Tolerances 5 standard errors.
        var q = 1 - p;
        var fourth = variance * (1 + 3 * p * q * (n - 2));
        var (sampleMean, sampleVariance) = SampleMoments.MeanAndVariance(draws, mean);
        var meanError = Math.Sqrt(variance / Draws);
        var varianceError = Math.Sqrt((fourth - variance * variance) / Draws);
        Assert.InRange(sampleMean, mean - 5 * meanError, mean + 5 * meanError);
        Assert.InRange(sampleVariance, variance - 5 * varianceError, variance + 5 * varianceError);
    }

    [Fact]
    public void Degenerate_cases_return_at_once_without_drawing()
    {
        var rng = new Xoshiro256StarStar(8);
        var untouched = rng;
        Assert.Equal(0, BinomialSampler.Sample(ref rng, 0, 0.4));
        Assert.Equal(0, BinomialSampler.Sample(ref rng, 17, 0.0));
        Assert.Equal(17, BinomialSampler.Sample(ref rng, 17, 1.0));
        Assert.Equal(untouched.NextUInt64(), rng.NextUInt64());
    }

    [Fact]
    public void Bad_arguments_are_refused_with_a_clear_message()
    {
        var rng = new Xoshiro256StarStar(8);
        Assert.Contains("trial count", Assert.Throws<ArgumentOutOfRangeException>(() => BinomialSampler.Sample(ref rng, -1, 0.5)).Message);
        Assert.Contains("probability", Assert.Throws<ArgumentOutOfRangeException>(() => BinomialSampler.Sample(ref rng, 3, 1.5)).Message);
        Assert.Contains("probability", Assert.Throws<ArgumentOutOfRangeException>(() => BinomialSampler.Sample(ref rng, 3, double.NaN)).Message);
    }
}
