using CopyNumber.Analysis;
using MathNet.Numerics;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// The mode count on distributions whose modality is known: Poisson, binomial and negative-binomial laws
/// are unimodal for every parameter (the first two and the negative binomial with r ≥ 1 are discrete
/// log-concave, the negative binomial with r &lt; 1 is decreasing; Keilson &amp; Gerber 1971, J. Am. Stat.
/// Assoc. 66:386; quoted from memory), while well-separated mixtures and a zero spike beside a bump are
/// not. Exact pmfs are computed here from their formulas; sampled histograms use fixed seeds.
/// </summary>
public sealed class ModeCountTests
{
    private static CountDistribution Exact(Func<long, double> logPmf, long from, long to) =>
        CountDistribution.FromProbabilities(
            Enumerable.Range(0, (int)(to - from + 1)).Select(i => from + i).ToArray(),
            Enumerable.Range(0, (int)(to - from + 1)).Select(i => Math.Exp(logPmf(from + i))).ToArray());

    private static double PoissonLog(double mean, long n) => n * Math.Log(mean) - mean - SpecialFunctions.GammaLn(n + 1);

    private static CountDistribution Poisson(double mean) =>
        Exact(n => PoissonLog(mean, n), Math.Max(0, (long)(mean - 15 * Math.Sqrt(mean) - 10)), (long)(mean + 15 * Math.Sqrt(mean) + 20));

    [Theory]
    [InlineData(0.1)]
    [InlineData(1.0)]   // p(0) = p(1): a flat top of two values
    [InlineData(3.0)]   // p(2) = p(3)
    [InlineData(7.5)]
    [InlineData(57.3)]
    [InlineData(1000.0)]
    [InlineData(20000.0)]
    public void PoissonOfAnyMeanHasOneModeAtTheFloorOfItsMean(double mean)
    {
        // The Poisson mode is ⌊λ⌋ (and λ − 1 as well for an integer λ) (Johnson, Kemp & Kotz 2005,
        // Univariate Discrete Distributions, 3rd ed., §4.2; quoted from memory).
        var result = ModeCount.Count(Poisson(mean));
        Assert.Equal(1, result.Count);
        Assert.InRange(result.Modes[0].Value, (long)Math.Floor(mean) - 1, (long)Math.Floor(mean) + 1);
        Assert.Equal(1.0, result.Bandwidth); // exact distribution: the minimum width
    }

    [Theory]
    [InlineData(10, 0.5)]
    [InlineData(50, 0.02)]
    [InlineData(400, 0.97)]
    [InlineData(3000, 0.3)]
    public void BinomialHasOneMode(int trials, double p)
    {
        double LogPmf(long k) => SpecialFunctions.BinomialLn(trials, (int)k) + k * Math.Log(p) + (trials - k) * Math.Log(1 - p);
        Assert.Equal(1, ModeCount.Count(Exact(LogPmf, 0, trials)).Count);
    }

    [Theory]
    [InlineData(0.3, 20.0)]  // r < 1: decreasing from 0, heavy tail
    [InlineData(1.0, 200.0)] // geometric
    [InlineData(5.0, 40.0)]
    [InlineData(50.0, 3000.0)]
    public void NegativeBinomialHasOneMode(double r, double mean)
    {
        var q = r / (r + mean); // success probability; P(k) = Γ(k + r)/(k!Γ(r))·q^r·(1 − q)^k
        double LogPmf(long k) => SpecialFunctions.GammaLn(k + r) - SpecialFunctions.GammaLn(k + 1) - SpecialFunctions.GammaLn(r)
            + r * Math.Log(q) + k * Math.Log(1 - q);
        var sd = Math.Sqrt(mean + mean * mean / r);
        Assert.Equal(1, ModeCount.Count(Exact(LogPmf, 0, (long)(mean + 40 * sd + 50))).Count);
    }

    [Theory]
    [InlineData(0.5)] // equal halves
    [InlineData(0.8)] // a minority population far away: its peak is ~7% as high as the first
    public void MixtureOfTwoSeparatedPoissonsHasTwoModes(double weightOfFive)
    {
        // w·Poisson(5) + (1 − w)·Poisson(60): the dip between them is ~10⁻¹⁰ of either peak.
        double Pmf(long n) => weightOfFive * Math.Exp(PoissonLog(5, n)) + (1 - weightOfFive) * Math.Exp(PoissonLog(60, n));
        var result = ModeCount.Count(Exact(n => Math.Log(Pmf(n)), 0, 150));
        Assert.Equal(2, result.Count);
        Assert.InRange(result.Modes[0].Value, 3, 6);
        Assert.InRange(result.Modes[1].Value, 58, 61);
    }

    [Fact]
    public void ZeroSpikeBesideABumpIsAMode()
    {
        // Zero-inflated Poisson: 0.3·δ₀ + 0.7·Poisson(20); the spike at 0 is a mode of its own.
        double Pmf(long n) => (n == 0 ? 0.3 : 0) + 0.7 * Math.Exp(PoissonLog(20, n));
        var result = ModeCount.Count(Exact(n => Math.Log(Pmf(n)), 0, 100));
        Assert.Equal(2, result.Count);
        Assert.Equal(0, result.Modes[0].Value);
        Assert.InRange(result.Modes[1].Value, 18, 21);
    }

    [Fact]
    public void PointMassHasOneMode()
    {
        var result = ModeCount.Count(CountDistribution.FromCounts([42], [500]));
        Assert.Equal(1, result.Count);
        Assert.Equal(42, result.Modes[0].Value);
    }

    private static CountDistribution Sample(int seed, int n, Func<Random, long> draw)
    {
        var random = new Random(seed);
        var counts = new SortedDictionary<long, long>();
        for (var i = 0; i < n; i++)
        {
            var v = draw(random);
            counts[v] = counts.GetValueOrDefault(v) + 1;
        }
        return CountDistribution.FromCounts(counts.Keys.ToArray(), counts.Values.ToArray());
    }

    [Fact]
    public void SampledHistogramsGiveTheModesOfTheirLaws()
    {
        // 1000 draws each, fixed seeds (MathNet's samplers on System.Random). Sampling noise makes many
        // small local maxima; the rule must see through them.
        var unimodal = new (string Law, Func<Random, long> Draw)[]
        {
            ("Poisson(30)", r => MathNet.Numerics.Distributions.Poisson.Sample(r, 30)),
            ("Poisson(0.7)", r => MathNet.Numerics.Distributions.Poisson.Sample(r, 0.7)),
            ("Binomial(60, 0.4)", r => Binomial.Sample(r, 0.4, 60)),
            ("NegativeBinomial(r = 0.5, mean 20)", r => NegativeBinomial.Sample(r, 0.5, 0.5 / 20.5)),
            ("NegativeBinomial(r = 3, mean 40)", r => NegativeBinomial.Sample(r, 3, 3 / 43.0)),
        };
        foreach (var (law, draw) in unimodal)
        {
            var histogram = Sample(20240601, 1000, draw);
            Assert.True(ModeCount.Count(histogram).Count == 1, law);
        }

        var mixture = Sample(7, 1000, r => MathNet.Numerics.Distributions.Poisson.Sample(r, r.NextDouble() < 0.5 ? 5 : 60));
        Assert.Equal(2, ModeCount.Count(mixture).Count);
        var zeroInflated = Sample(11, 1000, r => r.NextDouble() < 0.3 ? 0 : MathNet.Numerics.Distributions.Poisson.Sample(r, 20));
        var result = ModeCount.Count(zeroInflated);
        Assert.Equal(2, result.Count);
        Assert.Equal(0, result.Modes[0].Value);
    }

    [Fact]
    public void DiscreteGaussianKernelIsBesselWeightedAndHasVarianceT()
    {
        // T(k; t) = e^(−t)·I_k(t) (Lindeberg 1990, IEEE Trans. PAMI 12:234), compared with MathNet's
        // modified Bessel functions I₀ and I₁; Σ_k T = 1 and Σ_k k²·T = t (Abramowitz & Stegun 1964, 9.6.37).
        foreach (var t in new[] { 1.0, 6.25, 400.0 })
        {
            var kernel = new DiscreteGaussianKernel(Math.Sqrt(t));
            Assert.Equal(Math.Exp(-t) * SpecialFunctions.BesselI0(t), kernel[0], 1e-12);
            Assert.Equal(Math.Exp(-t) * SpecialFunctions.BesselI1(t), kernel[1], 1e-12);
            Assert.Equal(kernel[1], kernel[-1]);
            double sum = 0, second = 0;
            for (var k = -kernel.Reach; k <= kernel.Reach; k++) { sum += kernel[k]; second += (double)k * k * kernel[k]; }
            Assert.Equal(1.0, sum, 1e-12);
            Assert.Equal(t, second, 1e-9 * t);
        }
    }

    [Fact]
    public void BadHistogramsAreRejectedWithAMessage()
    {
        var negative = Assert.Throws<AnalysisInputException>(() => CountDistribution.FromCounts([1, 2], [3, -1]));
        Assert.Contains("cannot be negative", negative.Message);
        Assert.Throws<AnalysisInputException>(() => CountDistribution.FromCounts([1], [0]));
        Assert.Throws<AnalysisInputException>(() => CountDistribution.FromProbabilities([1, 2], [0.5]));
        Assert.Throws<AnalysisInputException>(() => ModeCount.Count(Poisson(3), new ModeCountRule { MaximumDipFraction = 0 }));
    }
}
