using CopyNumber.Randomness;
using MathNet.Numerics;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Randomness;

public class PoissonSamplerTests
{
    private const int Draws = 200_000;

    /// <summary>The Poisson pmf from its definition e^{−μ}μ^k/k!, in logs, with MathNet's log-gamma.</summary>
    private static double PoissonProbability(long k, double mean) =>
        Math.Exp(-mean + k * Math.Log(mean) - SpecialFunctions.GammaLn(k + 1.0));

    private static long[] Sample(double mean, int count, ulong seed)
    {
        var rng = new Xoshiro256StarStar(seed);
        var draws = new long[count];
        for (var i = 0; i < count; i++) draws[i] = PoissonSampler.Sample(ref rng, mean);
        return draws;
    }

    [Theory]
    [InlineData(0.5)]
    [InlineData(3.0)]
    [InlineData(9.9)]   // last mean drawn by inversion
    [InlineData(10.0)]  // first mean drawn by PTRS
    [InlineData(25.0)]
    [InlineData(1000.0)]
    [InlineData(1e6)]
    public void Draws_fit_the_exact_Poisson_law(double mean)
    {
        var draws = Sample(mean, Draws, seed: 20240601UL + (ulong)mean);
        // Support wide enough that the mass outside is below 10^-20 (over 15 standard deviations).
        var spread = 15 * Math.Sqrt(mean) + 30;
        var low = (long)Math.Max(0, Math.Floor(mean - spread));
        var high = (long)Math.Ceiling(mean + spread);
        var pValue = ChiSquareTest.PValue(draws, k => PoissonProbability(k, mean), low, high);
        Assert.True(pValue > ChiSquareTest.Level, $"chi-square p-value {pValue:E3} at mean {mean}");

        // Poisson: variance μ, fourth central moment μ(1 + 3μ), so the sample variance has standard
        // error √((μ + 2μ²)/n) (textbook moments; Kendall & Stuart for the variance of s²).
        var (sampleMean, sampleVariance) = SampleMoments.MeanAndVariance(draws, mean);
        var meanError = Math.Sqrt(mean / Draws);
        var varianceError = Math.Sqrt((mean + 2 * mean * mean) / Draws);
        Assert.InRange(sampleMean, mean - 5 * meanError, mean + 5 * meanError);
        Assert.InRange(sampleVariance, mean - 5 * varianceError, mean + 5 * varianceError);
    }

    [Theory]
    [InlineData(1e12)]
    [InlineData(4e15)]
    public void Huge_means_give_the_right_moments_and_a_normal_shape(double mean)
    {
        const int n = 100_000;
        var draws = Sample(mean, n, seed: 77);
        var (sampleMean, sampleVariance) = SampleMoments.MeanAndVariance(draws, mean);
        var meanError = Math.Sqrt(mean / n);
        var varianceError = Math.Sqrt((mean + 2 * mean * mean) / n);
        Assert.InRange(sampleMean, mean - 5 * meanError, mean + 5 * meanError);
        Assert.InRange(sampleVariance, mean - 5 * varianceError, mean + 5 * varianceError);

        // At these means the standardised Poisson law is normal to within its skewness 1/√μ ≤ 10^-6
        // (Berry–Esseen), far below the sampling error 1/√n of a bin proportion; so a chi-square test
        // against 20 equiprobable normal bins is a test of the shape (Pearson 1900).
        const int bins = 20;
        var observed = new int[bins];
        var sd = Math.Sqrt(mean);
        foreach (var draw in draws)
        {
            var z = (draw - mean) / sd;
            var bin = (int)Math.Floor(Normal.CDF(0, 1, z) * bins);
            observed[Math.Clamp(bin, 0, bins - 1)]++;
        }
        var expected = (double)n / bins;
        var statistic = observed.Sum(o => (o - expected) * (o - expected) / expected);
        var pValue = 1 - ChiSquared.CDF(bins - 1, statistic);
        Assert.True(pValue > ChiSquareTest.Level, $"chi-square p-value {pValue:E3} at mean {mean:E1}");
    }

    [Fact]
    public void Sampling_allocates_nothing()
    {
        // The hot-loop rule (RULES.md): tau-leaping draws many variates per step.
        var rng = new Xoshiro256StarStar(3);
        double[] means = [0, 0.2, 4, 12, 1e5, 1e12];
        var sum = 0L;
        for (var i = 0; i < 2_000; i++) sum += PoissonSampler.Sample(ref rng, means[i % means.Length]);
        // The JIT's tier-up can allocate on this thread while a round runs; a per-call allocation would show
        // in every round, so one clean round out of five shows the sampler itself allocates nothing.
        var fewest = long.MaxValue;
        for (var round = 0; round < 5 && fewest > 0; round++)
        {
            var before = GC.GetAllocatedBytesForCurrentThread();
            for (var i = 0; i < 10_000; i++) sum += PoissonSampler.Sample(ref rng, means[i % means.Length]);
            fewest = Math.Min(fewest, GC.GetAllocatedBytesForCurrentThread() - before);
        }
        Assert.Equal(0, fewest);
        Assert.True(sum > 0);
    }

    [Fact]
    public void A_zero_mean_gives_zero_and_draws_nothing()
    {
        var rng = new Xoshiro256StarStar(5);
        var untouched = rng;
        for (var i = 0; i < 100; i++) Assert.Equal(0, PoissonSampler.Sample(ref rng, 0.0));
        Assert.Equal(untouched.NextUInt64(), rng.NextUInt64());
    }

    [Fact]
    public void Tiny_means_fire_with_probability_close_to_the_mean()
    {
        // P(K ≥ 1) = 1 − e^{−μ} ≈ μ for μ = 10^-3: a binomial proportion, tolerance 5 standard errors.
        const double mean = 1e-3;
        var draws = Sample(mean, Draws, seed: 31);
        var nonZero = draws.Count(d => d > 0);
        var p = 1 - Math.Exp(-mean);
        var error = Math.Sqrt(p * (1 - p) / Draws);
        Assert.InRange((double)nonZero / Draws, p - 5 * error, p + 5 * error);
    }

    [Theory]
    [InlineData(-1.0)]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    [InlineData(1e16)]
    public void Bad_means_are_refused_with_a_clear_message(double mean)
    {
        var rng = new Xoshiro256StarStar(1);
        var error = Assert.Throws<ArgumentOutOfRangeException>(() => PoissonSampler.Sample(ref rng, mean));
        Assert.Contains("Poisson mean", error.Message);
    }
}
