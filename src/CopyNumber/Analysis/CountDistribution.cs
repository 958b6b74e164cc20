using CopyNumber.Ensembles;

namespace CopyNumber.Analysis;

/// <summary>
/// The distribution of an integer quantity at one time: distinct copy numbers (increasing) and their
/// probabilities, with the number of replicates behind them. An exact histogram from an ensemble of n
/// replicates has <see cref="SampleSize"/> = n; an exact probability mass function (from a master
/// equation or a formula) has <see cref="double.PositiveInfinity"/>.
/// </summary>
public sealed class CountDistribution
{
    private readonly long[] _values;
    private readonly double[] _probabilities;

    private CountDistribution(long[] values, double[] probabilities, double sampleSize)
    {
        _values = values;
        _probabilities = probabilities;
        SampleSize = sampleSize;
    }

    /// <summary>Distinct copy numbers with nonzero probability, increasing.</summary>
    public IReadOnlyList<long> Values => _values;

    /// <summary>Probabilities matching <see cref="Values"/>; they sum to 1.</summary>
    public IReadOnlyList<double> Probabilities => _probabilities;

    /// <summary>Number of replicates the probabilities come from; +∞ for an exact distribution.</summary>
    public double SampleSize { get; }

    /// <summary>Smallest copy number with nonzero probability.</summary>
    public long Minimum => _values[0];

    /// <summary>Largest copy number with nonzero probability.</summary>
    public long Maximum => _values[^1];

    /// <summary>The mean Σ x·p(x), in copies.</summary>
    public double Mean
    {
        get
        {
            var mean = 0.0;
            for (var i = 0; i < _values.Length; i++) mean += _values[i] * _probabilities[i];
            return mean;
        }
    }

    /// <summary>The variance Σ (x − mean)²·p(x) of the distribution itself (no n − 1 correction), in copies².</summary>
    public double Variance
    {
        get
        {
            var mean = Mean;
            var variance = 0.0;
            for (var i = 0; i < _values.Length; i++) variance += (_values[i] - mean) * (_values[i] - mean) * _probabilities[i];
            return variance;
        }
    }

    /// <summary>P(x = 0).</summary>
    public double ProbabilityOfZero
    {
        get
        {
            var i = Array.BinarySearch(_values, 0L);
            return i >= 0 ? _probabilities[i] : 0.0;
        }
    }

    /// <summary>
    /// The smallest copy number q with P(x ≤ q) ≥ <paramref name="level"/> (the lower quantile of a
    /// discrete distribution), for 0 &lt; level ≤ 1.
    /// </summary>
    public long Quantile(double level)
    {
        if (!(level > 0 && level <= 1)) throw new ArgumentOutOfRangeException(nameof(level), "a quantile level lies in (0, 1]");
        var cumulative = 0.0;
        for (var i = 0; i < _values.Length; i++)
        {
            cumulative += _probabilities[i];
            // 1e-12 absorbs the rounding of the running sum, so a level that is an exact sum is reached.
            if (cumulative >= level - 1e-12) return _values[i];
        }
        return _values[^1];
    }

    /// <summary>An ensemble histogram: how many of the replicates had each copy number.</summary>
    /// <param name="values">Copy numbers, in any order; a value may repeat (its counts add up).</param>
    /// <param name="replicates">How many replicates had the matching value (≥ 0).</param>
    /// <exception cref="AnalysisInputException">Lengths differ, a count is negative, or no replicate is counted.</exception>
    public static CountDistribution FromCounts(IReadOnlyList<long> values, IReadOnlyList<long> replicates)
    {
        ArgumentNullException.ThrowIfNull(values);
        ArgumentNullException.ThrowIfNull(replicates);
        if (values.Count != replicates.Count)
            throw new AnalysisInputException($"a histogram needs one replicate count per value, but has {values.Count} values and {replicates.Count} counts");
        long total = 0;
        var weights = new double[replicates.Count];
        for (var i = 0; i < replicates.Count; i++)
        {
            if (replicates[i] < 0) throw new AnalysisInputException($"the histogram counts {replicates[i]} replicates at copy number {values[i]}; counts cannot be negative");
            total += replicates[i];
            weights[i] = replicates[i];
        }
        if (total == 0) throw new AnalysisInputException("the histogram counts no replicates");
        return Build(values, weights, total);
    }

    /// <summary>The distribution of an ensemble's exact histogram; the sample size is its number of observations.</summary>
    /// <exception cref="AnalysisInputException">The histogram is empty.</exception>
    public static CountDistribution FromHistogram(CountHistogram histogram)
    {
        ArgumentNullException.ThrowIfNull(histogram);
        if (histogram.IsEmpty) throw new AnalysisInputException("the histogram counts no replicates");
        var bars = histogram.ToArray();
        return FromCounts(bars.Select(b => b.Value).ToArray(), bars.Select(b => b.Frequency).ToArray());
    }

    /// <summary>A distribution from probabilities (normalised here).</summary>
    /// <param name="values">Copy numbers, in any order; a value may repeat (its probabilities add up).</param>
    /// <param name="probabilities">Nonnegative finite weights, one per value, not all zero.</param>
    /// <param name="sampleSize">Replicates behind the probabilities; +∞ (the default) for an exact distribution.</param>
    /// <exception cref="AnalysisInputException">Lengths differ, a weight is negative or not finite, all weights are zero, or the sample size is not positive.</exception>
    public static CountDistribution FromProbabilities(IReadOnlyList<long> values, IReadOnlyList<double> probabilities, double sampleSize = double.PositiveInfinity)
    {
        ArgumentNullException.ThrowIfNull(values);
        ArgumentNullException.ThrowIfNull(probabilities);
        if (values.Count != probabilities.Count)
            throw new AnalysisInputException($"a distribution needs one probability per value, but has {values.Count} values and {probabilities.Count} probabilities");
        if (!(sampleSize > 0)) throw new AnalysisInputException($"the sample size must be positive (or infinite for an exact distribution), not {sampleSize}");
        for (var i = 0; i < probabilities.Count; i++)
            if (!(probabilities[i] >= 0) || double.IsInfinity(probabilities[i]))
                throw new AnalysisInputException($"the probability {probabilities[i]} at copy number {values[i]} is not a nonnegative finite number");
        return Build(values, probabilities.ToArray(), sampleSize);
    }

    private static CountDistribution Build(IReadOnlyList<long> values, double[] weights, double sampleSize)
    {
        var merged = new SortedDictionary<long, double>();
        for (var i = 0; i < values.Count; i++)
        {
            if (weights[i] == 0) continue;
            merged[values[i]] = merged.GetValueOrDefault(values[i]) + weights[i];
        }
        var sum = merged.Values.Sum();
        if (!(sum > 0)) throw new AnalysisInputException("the distribution has no probability mass");
        return new CountDistribution(merged.Keys.ToArray(), merged.Values.Select(w => w / sum).ToArray(), sampleSize);
    }
}
