using CopyNumber.Randomness;
using MathNet.Numerics;

namespace CopyNumber.Tests.Randomness;

public class SaddlePointExpansionTests
{
    private const double HalfLogTwoPi = 0.91893853320467274178;

    /// <summary>log n! by summing logarithms (the definition), with Kahan's compensation for moderate n.</summary>
    private static double LogFactorialBySum(int n)
    {
        double sum = 0, carry = 0;
        for (var i = 2; i <= n; i++)
        {
            var term = Math.Log(i) - carry;
            var next = sum + term;
            carry = next - sum - term;
            sum = next;
        }
        return sum;
    }

    [Fact]
    public void The_Stirling_error_matches_its_definition()
    {
        // δ(n) = log n! − (n + ½)log n + n − ½log 2π (Abramowitz & Stegun 1964, 6.1.37–6.1.41), with
        // log n! summed directly. The definition subtracts terms of size ~n·log n, so evaluating it in
        // doubles is itself good only to a few ulps of those terms: the tolerance is 4 such ulps.
        for (var n = 1; n <= 300; n++)
        {
            var logFactorial = LogFactorialBySum(n);
            var main = (n + 0.5) * Math.Log(n);
            var exact = logFactorial - main + n - HalfLogTwoPi;
            Assert.Equal(exact, SaddlePointExpansion.StirlingError(n), 4 * Math.BitIncrement(main) - 4 * main + 1e-16);
        }
        // For large n, δ(n) → 1/(12n) (Abramowitz & Stegun 6.1.41, leading term).
        Assert.Equal(1.0 / 12e12, SaddlePointExpansion.StirlingError(1e12), 1e-27);
    }

    [Fact]
    public void The_deviance_matches_its_definition_and_stays_non_negative()
    {
        // D(x, μ) = x log(x/μ) + μ − x; far from x = μ the direct formula is accurate, near it the
        // second-order Taylor term (x − μ)²/(2μ) is (Loader 2000).
        Assert.Equal(3.0, SaddlePointExpansion.Deviance(0, 3.0));
        Assert.Equal(50 * Math.Log(50 / 7.0) + 7 - 50, SaddlePointExpansion.Deviance(50, 7.0), 1e-12);
        const double mean = 1e12;
        for (var d = -3_000_000L; d <= 3_000_000; d += 250_000)
        {
            var x = mean + d;
            var t = d / mean;
            // Series (1+t)log(1+t) − t = t²/2 − t³/6 + t⁴/12 − …, times μ.
            var taylor = mean * (t * t / 2 - t * t * t / 6 + t * t * t * t / 12);
            var deviance = SaddlePointExpansion.Deviance(x, mean);
            Assert.True(deviance >= 0);
            Assert.Equal(taylor, deviance, 1e-9);
        }
    }

    [Fact]
    public void Poisson_log_probabilities_match_the_definition_for_moderate_arguments()
    {
        // log p(k) = k log μ − μ − log Γ(k + 1) (definition; MathNet's log-gamma), where cancellation is mild.
        foreach (var mean in new[] { 10.0, 37.5, 1000.0, 25_000.0 })
        for (var k = 0; k <= 3 * mean + 50; k += Math.Max(1, (int)(mean / 40)))
        {
            var logGamma = SpecialFunctions.GammaLn(k + 1.0);
            var definition = k * Math.Log(mean) - mean - logGamma;
            // The definition's own rounding grows with the size of the terms it subtracts.
            var tolerance = 1e-14 * (k * Math.Log(mean) + mean + logGamma) + 1e-12;
            Assert.Equal(definition, SaddlePointExpansion.LogPoissonProbability(k, mean), tolerance);
        }
    }

    [Fact]
    public void Poisson_probabilities_at_a_huge_mean_obey_the_ratio_identity_and_sum_to_one()
    {
        // p(k + 1)/p(k) = μ/(k + 1) exactly (definition). At μ = 10^12 the naive form loses ~10^-2 in
        // log p; the saddle-point form must keep the identity to 10^-12.
        const double mean = 1e12;
        for (var d = -10_000_000L; d <= 10_000_000; d += 97_531)
        {
            var k = mean + d;
            var step = SaddlePointExpansion.LogPoissonProbability(k + 1, mean) - SaddlePointExpansion.LogPoissonProbability(k, mean);
            Assert.Equal(Math.Log(mean / (k + 1)), step, 1e-12);
        }

        // Σ p(k) = 1 over ±12 standard deviations at μ = 10^10 (the mass outside is below 10^-32).
        const double big = 1e10;
        var sd = Math.Sqrt(big);
        var total = 0.0;
        for (var k = big - 12 * sd; k <= big + 12 * sd; k++) total += Math.Exp(SaddlePointExpansion.LogPoissonProbability(k, big));
        Assert.Equal(1.0, total, 1e-9);
    }

    [Fact]
    public void Binomial_log_probabilities_match_the_definition()
    {
        // log b(k) = log Γ(n+1) − log Γ(k+1) − log Γ(n−k+1) + k log p + (n−k) log q (definition).
        foreach (var (n, p) in new[] { (1.0, 0.3), (20.0, 0.3), (1000.0, 0.5), (5000.0, 0.01) })
        for (var k = 0.0; k <= n; k += Math.Max(1, Math.Floor(n / 50)))
        {
            double[] terms = [SpecialFunctions.GammaLn(n + 1), -SpecialFunctions.GammaLn(k + 1), -SpecialFunctions.GammaLn(n - k + 1),
                k * Math.Log(p), (n - k) * Math.Log(1 - p)];
            var tolerance = 1e-14 * terms.Sum(Math.Abs) + 1e-12;
            Assert.Equal(terms.Sum(), SaddlePointExpansion.LogBinomialProbability(k, n, p, 1 - p), tolerance);
        }
    }

    [Fact]
    public void LogOnePlus_is_accurate_for_tiny_arguments()
    {
        // log(1 + x) = x − x²/2 + x³/3 − … (Taylor series), where fl(1 + x) alone would lose x.
        foreach (var x in new[] { 1e-20, -3e-17, 1e-10, -2.5e-6 })
            Assert.Equal(x - x * x / 2 + x * x * x / 3, SaddlePointExpansion.LogOnePlus(x), Math.Abs(x) * 1e-15);
        Assert.Equal(Math.Log(1.5), SaddlePointExpansion.LogOnePlus(0.5), 1e-15);
    }
}
