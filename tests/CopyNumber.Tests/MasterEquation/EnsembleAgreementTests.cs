using CopyNumber.MasterEquation;
using CopyNumber.Randomness;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>The Kolmogorov test behind <c>simulate --check-exact</c>: its critical values and its false-alarm rate.</summary>
public sealed class EnsembleAgreementTests
{
    /// <summary>
    /// Kolmogorov's limiting distribution: P(K &gt; 1.3581) = 0.05 and P(K &gt; 1.6276) = 0.01 (Smirnov 1948,
    /// Ann. Math. Stat. 19:279, table of the limiting distribution; quoted from memory to four digits).
    /// </summary>
    [Theory]
    [InlineData(0.05, 1.3581)]
    [InlineData(0.01, 1.6276)]
    public void CriticalValuesAreKolmogorovs(double alpha, double lambda) =>
        Assert.Equal(lambda, EnsembleAgreementTest.KolmogorovQuantile(alpha), 3);

    /// <summary>
    /// The false-alarm rate measured over 400 seeds: samples of 500 drawn from a Poisson(6) law itself, compared at
    /// 5 "grid times" (independent samples) with the level 0.05 shared among them, fire in at most the nominal
    /// share. For a discrete law the test is conservative (common practice), so the rate must not exceed 0.05
    /// beyond its binomial sampling error (3 SD of a 0.05 rate over 400 seeds ≈ 0.033).
    /// </summary>
    [Fact]
    public void TheFamilyWiseFalseAlarmRateIsAtMostTheLevel()
    {
        var law = CopyNumber.Analysis.CountDistribution.FromProbabilities(Enumerable.Range(0, 40).Select(x => (long)x).ToArray(),
            Enumerable.Range(0, 40).Select(x => ExactModels.Poisson(6, x)).ToArray());
        const int seeds = 400, times = 5, n = 500;
        var lambda = EnsembleAgreementTest.KolmogorovQuantile(0.05 / times);
        var allowed = lambda / (Math.Sqrt(n) + 0.12 + 0.11 / Math.Sqrt(n));
        var alarms = 0;
        var cumulative = new double[law.Values.Count];
        for (var i = 0; i < cumulative.Length; i++) cumulative[i] = (i > 0 ? cumulative[i - 1] : 0) + law.Probabilities[i];
        for (var seed = 0; seed < seeds; seed++)
        {
            var random = new Xoshiro256StarStar((ulong)seed + 1);
            var fired = false;
            for (var t = 0; t < times; t++)
            {
                var counts = new long[law.Values.Count];
                for (var r = 0; r < n; r++)
                {
                    var u = random.NextDouble();
                    var x = Array.FindIndex(cumulative, c => c > u);
                    counts[x < 0 ? counts.Length - 1 : x]++;
                }
                var sample = new EnsembleHistogram(law.Values, counts.Select(c => c / (double)n).ToArray(), n);
                fired |= EnsembleAgreementTest.Distance(law, sample) > allowed;
            }
            if (fired) alarms++;
        }
        Assert.True(alarms / (double)seeds <= 0.05 + 3 * Math.Sqrt(0.05 * 0.95 / seeds), $"false-alarm rate {alarms / (double)seeds:F3}");
    }

    /// <summary>A sample from a shifted law (Poisson(7) against Poisson(6), n = 2000) is caught: D ≈ 0.08 against an allowed ≈ 0.04.</summary>
    [Fact]
    public void AShiftedLawIsCaught()
    {
        var values = Enumerable.Range(0, 40).Select(x => (long)x).ToArray();
        var law = CopyNumber.Analysis.CountDistribution.FromProbabilities(values, values.Select(x => ExactModels.Poisson(6, x)).ToArray());
        var shifted = new EnsembleHistogram(values, values.Select(x => ExactModels.Poisson(7, x)).ToArray(), 2000);
        var allowed = EnsembleAgreementTest.KolmogorovQuantile(0.01) / (Math.Sqrt(2000) + 0.12 + 0.11 / Math.Sqrt(2000));
        Assert.True(EnsembleAgreementTest.Distance(law, shifted) > allowed);
    }
}
