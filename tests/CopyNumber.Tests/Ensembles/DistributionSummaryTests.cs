using System.Numerics;
using CopyNumber.Ensembles;

namespace CopyNumber.Tests.Ensembles;

public class DistributionSummaryTests
{
    private static CountHistogram HistogramOf(IEnumerable<long> values)
    {
        var histogram = new CountHistogram();
        foreach (var value in values) histogram.Add(value);
        return histogram;
    }

    /// <summary>
    /// The unbiased variance as an exact rational (nΣd² − (Σd)²)/(n(n − 1)) over the integer
    /// deviations d = x − x₀ from the first value (the variance is shift-invariant), summed exactly in
    /// checked 128-bit integers and rounded once: the definition, free of floating-point cancellation.
    /// </summary>
    private static double ExactVariance(IReadOnlyList<long> values)
    {
        Int128 sum = 0, squares = 0;
        foreach (var value in values)
        {
            var deviation = (Int128)value - values[0];
            sum = checked(sum + deviation);
            squares = checked(squares + deviation * deviation);
        }
        BigInteger n = values.Count;
        return RationalToDouble(n * (BigInteger)squares - (BigInteger)sum * (BigInteger)sum, n * (n - 1));
    }

    private static double ExactMean(IReadOnlyCollection<long> values)
    {
        Int128 sum = 0;
        foreach (var value in values) sum = checked(sum + value);
        return RationalToDouble((BigInteger)sum, values.Count);
    }

    /// <summary>numerator/denominator to double with relative error ~10^-16: integer part, then the scaled remainder.</summary>
    private static double RationalToDouble(BigInteger numerator, BigInteger denominator)
    {
        var whole = BigInteger.DivRem(numerator, denominator, out var remainder);
        var scale = BigInteger.Pow(2, 64);
        return (double)whole + (double)(remainder * scale / denominator) / (double)scale;
    }

    private static long LowerQuantileBySorting(long[] sorted, int percent) =>
        sorted[Math.Max(1, (percent * sorted.Length + 99) / 100) - 1];

    [Fact]
    public void A_hand_computed_sample()
    {
        // 2, 4, 4, 4, 5, 5, 7, 9: mean 40/8 = 5, Σ(x − 5)² = 9+1+1+1+0+0+4+16 = 32, so variance 32/7;
        // lower quantiles by rank ⌈p·8⌉ (Hyndman & Fan 1996, definition 1): 5% → rank 1 = 2,
        // 25% → rank 2 = 4, 50% → rank 4 = 4, 75% → rank 6 = 5, 95% → rank 8 = 9. Worked by hand.
        var summary = DistributionSummary.From(HistogramOf([5, 2, 4, 9, 4, 7, 4, 5]));
        Assert.Equal(8, summary.Replicates);
        Assert.Equal(5.0, summary.Mean, 1e-15);
        Assert.Equal(32.0 / 7, summary.Variance, 1e-14);
        Assert.Equal(Math.Sqrt(32.0 / 7 / 8), summary.StandardError, 1e-15);
        Assert.Equal(32.0 / 7 / 5, summary.FanoFactor, 1e-15);
        Assert.Equal(32.0 / 7 / 25, summary.SquaredCoefficientOfVariation, 1e-15);
        Assert.Equal(2, summary.Minimum);
        Assert.Equal(2, summary.Quantile05);
        Assert.Equal(4, summary.Quantile25);
        Assert.Equal(4, summary.Median);
        Assert.Equal(5, summary.Quantile75);
        Assert.Equal(9, summary.Quantile95);
        Assert.Equal(9, summary.Maximum);
        Assert.Equal(0.0, summary.ZeroFraction);
    }

    [Fact]
    public void Random_samples_match_direct_computation_on_the_raw_list()
    {
        var random = new Random(3);
        foreach (var (n, low, high) in new[] { (2, 0, 3), (19, 0, 5), (20, -10, 10), (101, 0, 2), (1000, -3, 1_000_000), (5000, 0, 40) })
        {
            var values = Enumerable.Range(0, n).Select(_ => (long)random.Next(low, high)).ToList();
            var sorted = values.Order().ToArray();
            var summary = DistributionSummary.From(HistogramOf(values));
            var mean = ExactMean(values);
            var variance = ExactVariance(values);
            Assert.Equal(n, summary.Replicates);
            Assert.Equal(mean, summary.Mean, 1e-15 * Math.Max(1, Math.Abs(mean)));
            Assert.Equal(variance, summary.Variance, 1e-14 * variance);
            Assert.Equal(sorted[0], summary.Minimum);
            Assert.Equal(LowerQuantileBySorting(sorted, 5), summary.Quantile05);
            Assert.Equal(LowerQuantileBySorting(sorted, 25), summary.Quantile25);
            Assert.Equal(LowerQuantileBySorting(sorted, 50), summary.Median);
            Assert.Equal(LowerQuantileBySorting(sorted, 75), summary.Quantile75);
            Assert.Equal(LowerQuantileBySorting(sorted, 95), summary.Quantile95);
            Assert.Equal(sorted[^1], summary.Maximum);
            Assert.Equal(values.Count(v => v == 0) / (double)n, summary.ZeroFraction);
        }
    }

    [Fact]
    public void A_single_replicate_has_no_variance()
    {
        var summary = DistributionSummary.From(HistogramOf([42]));
        Assert.Equal(1, summary.Replicates);
        Assert.Equal(42.0, summary.Mean);
        Assert.True(double.IsNaN(summary.Variance));
        Assert.True(double.IsNaN(summary.StandardError));
        Assert.True(double.IsNaN(summary.FanoFactor));
        Assert.Equal(42, summary.Quantile05);
        Assert.Equal(42, summary.Median);
        Assert.Equal(42, summary.Quantile95);
    }

    [Fact]
    public void A_zero_mean_leaves_the_ratios_undefined()
    {
        // −1, 1: mean 0, variance 2 (by hand); Fano and CV² divide by the mean.
        var summary = DistributionSummary.From(HistogramOf([-1, 1]));
        Assert.Equal(0.0, summary.Mean);
        Assert.Equal(2.0, summary.Variance);
        Assert.True(double.IsNaN(summary.FanoFactor));
        Assert.True(double.IsNaN(summary.SquaredCoefficientOfVariation));
        Assert.Equal(-1, summary.Median);

        // A signed sample with a positive mean (−20, 22, 1: mean 1, variance 441): a Fano factor of 441 would
        // say nothing about noise, so neither ratio is given (common practice: both need a nonnegative quantity).
        var signed = DistributionSummary.From(HistogramOf([-20, 22, 1]));
        Assert.Equal(1.0, signed.Mean);
        Assert.True(double.IsNaN(signed.FanoFactor));
        Assert.True(double.IsNaN(signed.SquaredCoefficientOfVariation));

        var zeros = DistributionSummary.From(HistogramOf([0, 0, 0, 2]));
        Assert.Equal(0.75, zeros.ZeroFraction);
    }

    [Fact]
    public void Large_counts_with_tiny_variance_keep_their_precision()
    {
        // 10^6 samples of 10^9 + {−1, 0, 1}: the exact rational variance (definition) against ours to
        // 10^-9 relative. Naive Σx² − (Σx)²/n would need 10^24-sized sums and lose everything.
        var random = new Random(1_000_000_007);
        var values = new long[1_000_000];
        for (var i = 0; i < values.Length; i++) values[i] = 1_000_000_000L + random.Next(-1, 2);
        var summary = DistributionSummary.From(HistogramOf(values));
        var variance = ExactVariance(values);
        Assert.Equal(variance, summary.Variance, 1e-9 * variance);
        Assert.Equal(ExactMean(values), summary.Mean, 1e-15 * 1e9);

        // Near the top of the long range, where even the deviations from 0 overflow a double's mantissa.
        long[] huge = [long.MaxValue, long.MaxValue - 1, long.MaxValue - 2, long.MaxValue - 2];
        var hugeSummary = DistributionSummary.From(HistogramOf(huge));
        Assert.Equal(ExactVariance(huge), hugeSummary.Variance, 1e-12);
        Assert.Equal(long.MaxValue - 2, hugeSummary.Median);
    }

    [Fact]
    public void The_summary_does_not_depend_on_the_merge_order()
    {
        // Histograms are exact, so any grouping of the same replicates must give identical bits.
        var random = new Random(11);
        var parts = Enumerable.Range(0, 8)
            .Select(i => Enumerable.Range(0, 500).Select(_ => i == 3 ? random.NextInt64(0, 1_000_000_000_000) : random.Next(100, 400) * 1L).ToArray())
            .ToArray();
        var forward = new CountHistogram();
        foreach (var part in parts) forward.Merge(HistogramOf(part));
        var backward = new CountHistogram();
        foreach (var part in parts.Reverse()) backward.Merge(HistogramOf(part));
        var pairwise = HistogramOf(parts[6].Concat(parts[7]));
        for (var i = 5; i >= 0; i--) pairwise.Merge(HistogramOf(parts[i]));

        var a = DistributionSummary.From(forward);
        foreach (var b in new[] { DistributionSummary.From(backward), DistributionSummary.From(pairwise) })
        {
            Assert.Equal(BitConverter.DoubleToInt64Bits(a.Mean), BitConverter.DoubleToInt64Bits(b.Mean));
            Assert.Equal(BitConverter.DoubleToInt64Bits(a.Variance), BitConverter.DoubleToInt64Bits(b.Variance));
            Assert.Equal((a.Quantile05, a.Median, a.Quantile95, a.Maximum), (b.Quantile05, b.Median, b.Quantile95, b.Maximum));
        }
    }

    [Fact]
    public void An_empty_histogram_is_refused_with_a_clear_message()
    {
        var error = Assert.Throws<ArgumentException>(() => DistributionSummary.From(new CountHistogram()));
        Assert.Contains("empty histogram", error.Message);
    }
}
