namespace CopyNumber.Ensembles;

/// <summary>
/// Running count, mean, variance, minimum and maximum of a real-valued readout (a ratio, a rate, a
/// time-average), by Welford's update (Welford 1962, Technometrics 4:419–420) and the pairwise merge of
/// Chan, Golub &amp; LeVeque (1983, "Algorithms for computing the sample variance", The American
/// Statistician 37:242–247, eq. 2.1). Both are numerically stable: no sum of squares is ever formed.
/// Non-finite values (a ratio over zero) are counted in <see cref="NonFiniteCount"/> and kept out of the
/// moments, so one bad replicate cannot turn every statistic into NaN.
/// </summary>
/// <remarks>
/// Unlike <see cref="CountHistogram"/>, floating-point merging is not associative: the same values
/// added or merged in a different grouping give a mean and variance that agree to rounding (about
/// 10^-15 relative) but not bit for bit. Count, minimum, maximum and <see cref="NonFiniteCount"/> are
/// exact in any order. For byte-identical output across thread counts the ensemble must fix the
/// grouping independently of the threads: for example, accumulate replicates in fixed blocks of
/// consecutive replicate indices (each block added in index order) and merge the blocks in block order,
/// whichever thread ran each one.
/// </remarks>
public sealed class MomentAccumulator
{
    private long _count;
    private double _mean;
    private double _squaredDeviations;
    private double _minimum = double.PositiveInfinity;
    private double _maximum = double.NegativeInfinity;
    private long _nonFinite;

    /// <summary>The number of finite values added.</summary>
    public long Count => _count;

    /// <summary>The number of NaN or infinite values offered and left out of the moments.</summary>
    public long NonFiniteCount => _nonFinite;

    /// <summary>The mean of the finite values; NaN when there are none.</summary>
    public double Mean => _count > 0 ? _mean : double.NaN;

    /// <summary>The unbiased variance Σ(x − mean)²/(n − 1); NaN when fewer than two finite values.</summary>
    public double Variance => _count > 1 ? _squaredDeviations / (_count - 1) : double.NaN;

    /// <summary>The standard error of the mean √(variance/n); NaN when fewer than two finite values.</summary>
    public double StandardError => Math.Sqrt(Variance / _count);

    /// <summary>The smallest finite value; NaN when there are none.</summary>
    public double Minimum => _count > 0 ? _minimum : double.NaN;

    /// <summary>The largest finite value; NaN when there are none.</summary>
    public double Maximum => _count > 0 ? _maximum : double.NaN;

    /// <summary>Adds one observation (non-finite ones are only counted).</summary>
    public void Add(double value)
    {
        if (!double.IsFinite(value))
        {
            _nonFinite++;
            return;
        }
        _count++;
        var delta = value - _mean;
        _mean += delta / _count;
        _squaredDeviations += delta * (value - _mean);
        if (value < _minimum) _minimum = value;
        if (value > _maximum) _maximum = value;
    }

    /// <summary>Adds every observation summarised by <paramref name="other"/> (which is unchanged).</summary>
    public void Merge(MomentAccumulator other)
    {
        ArgumentNullException.ThrowIfNull(other);
        // Read everything first: other may be this.
        var count = other._count;
        var mean = other._mean;
        var squaredDeviations = other._squaredDeviations;
        _nonFinite += other._nonFinite;
        if (count == 0) return;
        if (other._minimum < _minimum) _minimum = other._minimum;
        if (other._maximum > _maximum) _maximum = other._maximum;
        if (_count == 0)
        {
            _count = count;
            _mean = mean;
            _squaredDeviations = squaredDeviations;
            return;
        }
        var total = _count + count;
        var delta = mean - _mean;
        var share = (double)count / total;
        _mean += delta * share;
        _squaredDeviations += squaredDeviations + delta * delta * _count * share;
        _count = total;
    }

    /// <summary>Everything the accumulator holds, exactly, for storing it and restoring it later with <see cref="FromState"/>.</summary>
    public MomentState State => new(_count, _nonFinite, _mean, _squaredDeviations, _minimum, _maximum);

    /// <summary>An accumulator holding exactly <paramref name="state"/>, as read back from a stored run.</summary>
    /// <exception cref="ArgumentException">The state is not one an accumulator can be in (see <see cref="MomentState"/>).</exception>
    public static MomentAccumulator FromState(MomentState state)
    {
        var problem = state.Problem();
        if (problem is not null) throw new ArgumentException($"not a moment accumulator's state: {problem}", nameof(state));
        var accumulator = new MomentAccumulator();
        accumulator.Restore(state);
        return accumulator;
    }

    /// <summary>Becomes an exact copy of <paramref name="other"/>.</summary>
    internal void CopyFrom(MomentAccumulator other) => Restore(other.State);

    private void Restore(MomentState state)
    {
        _count = state.Count;
        _nonFinite = state.NonFiniteCount;
        _mean = state.Mean;
        _squaredDeviations = state.SquaredDeviations;
        _minimum = state.Minimum;
        _maximum = state.Maximum;
    }

    /// <summary>Forgets every observation.</summary>
    public void Clear()
    {
        _count = 0;
        _mean = 0;
        _squaredDeviations = 0;
        _minimum = double.PositiveInfinity;
        _maximum = double.NegativeInfinity;
        _nonFinite = 0;
    }
}
