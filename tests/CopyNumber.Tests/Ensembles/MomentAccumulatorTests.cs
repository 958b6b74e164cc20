using CopyNumber.Ensembles;
using CopyNumber.Tests.Randomness;

namespace CopyNumber.Tests.Ensembles;

public class MomentAccumulatorTests
{
    private static double[] NormalSample(int n, double mean, double sd, int seed)
    {
        // Box–Muller (Box & Muller 1958, Ann. Math. Statist. 29:610) from System.Random, so the data
        // owe nothing to the engine's own generator.
        var random = new Random(seed);
        var values = new double[n];
        for (var i = 0; i < n; i++)
        {
            var radius = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble()));
            values[i] = mean + sd * radius * Math.Cos(2 * Math.PI * random.NextDouble());
        }
        return values;
    }

    private static MomentAccumulator AccumulatorOf(IEnumerable<double> values)
    {
        var accumulator = new MomentAccumulator();
        foreach (var value in values) accumulator.Add(value);
        return accumulator;
    }

    [Fact]
    public void A_hand_computed_sample()
    {
        // 2, 4, 4, 4, 5, 5, 7, 9: mean 5, variance 32/7 (worked by hand).
        var accumulator = AccumulatorOf([2, 4, 4, 4, 5, 5, 7, 9]);
        Assert.Equal(8, accumulator.Count);
        Assert.Equal(5.0, accumulator.Mean, 1e-15);
        Assert.Equal(32.0 / 7, accumulator.Variance, 1e-14);
        Assert.Equal(Math.Sqrt(32.0 / 7 / 8), accumulator.StandardError, 1e-15);
        Assert.Equal(2.0, accumulator.Minimum);
        Assert.Equal(9.0, accumulator.Maximum);
    }

    [Fact]
    public void Welford_agrees_with_the_two_pass_formula()
    {
        // Two-pass (Chan, Golub & LeVeque 1983, eq. 1.2) computed here on well-conditioned data.
        var values = NormalSample(100_000, 10, 3, seed: 1);
        AssertMatchesTwoPass(values, AccumulatorOf(values));
    }

    /// <summary>Count, mean and variance within 10^-13 and 10^-12 relative of the two-pass values; exact extremes.</summary>
    private static void AssertMatchesTwoPass(double[] values, MomentAccumulator accumulator)
    {
        var (mean, variance) = SampleMoments.MeanAndVariance(values);
        Assert.Equal(values.Length, accumulator.Count);
        Assert.Equal(mean, accumulator.Mean, 1e-13 * Math.Abs(mean));
        Assert.Equal(variance, accumulator.Variance, 1e-12 * variance);
        Assert.Equal(values.Min(), accumulator.Minimum);
        Assert.Equal(values.Max(), accumulator.Maximum);
    }

    [Fact]
    public void Welford_keeps_precision_for_a_large_offset()
    {
        // Data 10^9 + N(0, 1): the reference two-pass runs on x − 10^9, which is exact (the operands
        // are within a factor 2 of each other, Sterbenz 1974), so it sees data near 0. Welford's
        // running mean takes one rounding of at most ulp(10^9)/2 ≈ 6·10^-8 per update, and these add
        // up like a random walk, so after n updates it is off by well under e = ulp·√n ≈ 1.2·10^-4.
        // In the update M₂ += δ·(x − mean) an error e in the mean shifts each term by about 2δe, and
        // the δ have mean zero, so M₂/(nσ²) moves by about 2e/(σ√n) ≈ 2.4·10^-7, plus (e/σ)² at second
        // order: tolerance 10^-6 relative.
        const double offset = 1e9;
        var values = NormalSample(1_000_000, offset, 1, seed: 2);
        var (shiftedMean, variance) = SampleMoments.MeanAndVariance(values.Select(v => v - offset).ToArray());
        var accumulator = AccumulatorOf(values);
        var ulp = Math.BitIncrement(offset) - offset;
        Assert.Equal(offset + shiftedMean, accumulator.Mean, ulp * Math.Sqrt(values.Length));
        Assert.Equal(variance, accumulator.Variance, 1e-6 * variance);
    }

    [Fact]
    public void Merging_agrees_with_one_pass_over_all_the_data()
    {
        // Chan, Golub & LeVeque (1983, eq. 2.1) merge of uneven chunks, merged in a tree, against the
        // two-pass formula on the concatenation.
        var values = NormalSample(50_000, -4, 0.5, seed: 3);
        int[] sizes = [1, 0, 7, 1000, 12_345, 2, 20_000, 16_645];
        var chunks = new List<MomentAccumulator>();
        var start = 0;
        foreach (var size in sizes)
        {
            chunks.Add(AccumulatorOf(values.Skip(start).Take(size)));
            start += size;
        }
        Assert.Equal(values.Length, start);
        while (chunks.Count > 1)
        {
            var next = new List<MomentAccumulator>();
            for (var i = 0; i < chunks.Count; i += 2)
            {
                if (i + 1 < chunks.Count) chunks[i].Merge(chunks[i + 1]);
                next.Add(chunks[i]);
            }
            chunks = next;
        }
        AssertMatchesTwoPass(values, chunks[0]);
    }

    [Fact]
    public void Merging_with_empty_and_with_itself()
    {
        var accumulator = AccumulatorOf([1, 2, 3, 4]);
        accumulator.Merge(new MomentAccumulator());
        Assert.Equal(4, accumulator.Count);
        var empty = new MomentAccumulator();
        empty.Merge(accumulator);
        Assert.Equal((4L, 2.5, 5.0 / 3), (empty.Count, empty.Mean, empty.Variance));

        // 1, 2, 3, 4 twice: mean 2.5, Σ(x − 2.5)² = 10, variance 10/7 (by hand).
        accumulator.Merge(accumulator);
        Assert.Equal(8, accumulator.Count);
        Assert.Equal(2.5, accumulator.Mean);
        Assert.Equal(10.0 / 7, accumulator.Variance, 1e-15);
    }

    [Fact]
    public void Non_finite_values_are_counted_and_kept_out_of_the_moments()
    {
        var accumulator = AccumulatorOf([1, double.NaN, 3, double.PositiveInfinity, double.NegativeInfinity]);
        Assert.Equal(2, accumulator.Count);
        Assert.Equal(3, accumulator.NonFiniteCount);
        Assert.Equal(2.0, accumulator.Mean);
        Assert.Equal(2.0, accumulator.Variance);
        var other = AccumulatorOf([double.NaN]);
        other.Merge(accumulator);
        Assert.Equal(4, other.NonFiniteCount);
        Assert.Equal(2, other.Count);
    }

    [Fact]
    public void Too_few_values_give_NaN_and_clear_resets()
    {
        var accumulator = new MomentAccumulator();
        Assert.True(double.IsNaN(accumulator.Mean));
        Assert.True(double.IsNaN(accumulator.Minimum));
        accumulator.Add(7);
        Assert.Equal(7.0, accumulator.Mean);
        Assert.True(double.IsNaN(accumulator.Variance));
        accumulator.Clear();
        Assert.Equal(0, accumulator.Count);
        Assert.True(double.IsNaN(accumulator.Maximum));
        accumulator.Add(-1);
        Assert.Equal(-1.0, accumulator.Minimum);
    }
}
