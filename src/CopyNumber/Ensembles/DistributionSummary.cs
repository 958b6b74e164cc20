namespace CopyNumber.Ensembles;

/// <summary>
/// The statistics reported for one readout at one recording time, derived exactly from a
/// <see cref="CountHistogram"/> of the replicates' values. Since the histogram is exact and
/// order-independent, so is every figure here: the same replicates give the same bits whatever the
/// thread count or merge order.
/// </summary>
/// <remarks>
/// <para>Moments: the mean is computed exactly in 128-bit integers as min + Σf·(v − min)/n and rounded
/// once; the variance is the corrected two-pass formula of Chan, Golub &amp; LeVeque (1983, "Algorithms
/// for computing the sample variance", The American Statistician 37:242–247) Σf·d² − (Σf·d)²/n over the
/// deviations d = v − mean, each d formed from an exact integer difference, with compensated sums. So
/// counts near 10^9 with a variance near 1 keep all their precision.</para>
/// <para>Quantiles follow <see cref="CountHistogram.Quantile"/>: the smallest observed v with F(v) ≥ p,
/// i.e. the observation of rank ⌈p·n⌉ (Hyndman &amp; Fan 1996, definition 1); the median of an even
/// number of replicates is the lower middle one.</para>
/// </remarks>
public sealed class DistributionSummary
{
    private static readonly decimal[] ReportedProbabilities = [0.05m, 0.25m, 0.5m, 0.75m, 0.95m];

    private DistributionSummary(long replicates, double mean, double variance, long[] quantiles, long minimum, long maximum, double zeroFraction)
    {
        Replicates = replicates;
        Mean = mean;
        Variance = variance;
        StandardError = Math.Sqrt(variance / replicates);
        FanoFactor = NoiseRatios.Fano(mean, variance, minimum);
        SquaredCoefficientOfVariation = NoiseRatios.SquaredCoefficientOfVariation(mean, variance, minimum);
        Minimum = minimum;
        Quantile05 = quantiles[0];
        Quantile25 = quantiles[1];
        Median = quantiles[2];
        Quantile75 = quantiles[3];
        Quantile95 = quantiles[4];
        Maximum = maximum;
        ZeroFraction = zeroFraction;
    }

    /// <summary>n, the number of replicates summarised.</summary>
    public long Replicates { get; }

    /// <summary>The sample mean, in molecules (or the readout's unit).</summary>
    public double Mean { get; }

    /// <summary>The unbiased sample variance Σ(v − mean)²/(n − 1); NaN when n = 1.</summary>
    public double Variance { get; }

    /// <summary>The standard error of the mean, √(variance/n); NaN when n = 1.</summary>
    public double StandardError { get; }

    /// <summary>The Fano factor variance/mean (1 for a Poisson law); NaN when the mean is 0 or some replicate is negative.</summary>
    public double FanoFactor { get; }

    /// <summary>The squared coefficient of variation variance/mean²; NaN when the mean is 0 or some replicate is negative.</summary>
    public double SquaredCoefficientOfVariation { get; }

    /// <summary>The smallest replicate value.</summary>
    public long Minimum { get; }

    /// <summary>The lower empirical 5% quantile (rank ⌈0.05·n⌉).</summary>
    public long Quantile05 { get; }

    /// <summary>The lower empirical 25% quantile (rank ⌈0.25·n⌉).</summary>
    public long Quantile25 { get; }

    /// <summary>The lower median (rank ⌈0.5·n⌉).</summary>
    public long Median { get; }

    /// <summary>The lower empirical 75% quantile (rank ⌈0.75·n⌉).</summary>
    public long Quantile75 { get; }

    /// <summary>The lower empirical 95% quantile (rank ⌈0.95·n⌉).</summary>
    public long Quantile95 { get; }

    /// <summary>The largest replicate value.</summary>
    public long Maximum { get; }

    /// <summary>The fraction of replicates whose value is exactly 0, in [0, 1].</summary>
    public double ZeroFraction { get; }

    /// <summary>Summarises the replicates recorded in <paramref name="histogram"/>.</summary>
    /// <exception cref="ArgumentException">The histogram is empty.</exception>
    public static DistributionSummary From(CountHistogram histogram)
    {
        ArgumentNullException.ThrowIfNull(histogram);
        if (histogram.IsEmpty) throw new ArgumentException("cannot summarise an empty histogram: it holds no replicates", nameof(histogram));
        var bars = histogram.ToArray();
        var n = histogram.Total;
        var minimum = bars[0].Value;
        var maximum = bars[^1].Value;

        // Σf·(v − min) < n·2^64 ≤ 2^127: no overflow in 128 bits.
        UInt128 shiftedSum = 0;
        foreach (var bar in bars) shiftedSum += (UInt128)unchecked((ulong)(bar.Value - minimum)) * (ulong)bar.Frequency;
        var wholePart = (ulong)(shiftedSum / (ulong)n);
        var remainder = (ulong)(shiftedSum % (ulong)n);
        var centre = unchecked(minimum + (long)wholePart); // min ≤ centre ≤ max
        var fraction = (double)remainder / n;
        var mean = centre + fraction;

        var variance = double.NaN;
        if (n > 1)
        {
            var first = new CompensatedSum();
            var second = new CompensatedSum();
            foreach (var bar in bars)
            {
                var deviation = (double)((Int128)bar.Value - centre) - fraction;
                var weighted = bar.Frequency * deviation;
                first.Add(weighted);
                second.Add(weighted * deviation);
            }
            var squares = second.Value - first.Value * first.Value / n;
            variance = Math.Max(0.0, squares) / (n - 1);
        }

        return new DistributionSummary(n, mean, variance, Quantiles(bars, n), minimum, maximum, (double)histogram.FrequencyOf(0) / n);
    }

    private static long[] Quantiles(CountFrequency[] bars, long n)
    {
        var quantiles = new long[ReportedProbabilities.Length];
        var next = 0;
        var cumulative = 0L;
        foreach (var bar in bars)
        {
            cumulative += bar.Frequency;
            while (next < quantiles.Length && cumulative >= CountHistogram.QuantileRank(ReportedProbabilities[next], n))
                quantiles[next++] = bar.Value;
            if (next == quantiles.Length) break;
        }
        return quantiles;
    }
}
