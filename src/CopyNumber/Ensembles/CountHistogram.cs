using System.Collections;
using System.Diagnostics.CodeAnalysis;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace CopyNumber.Ensembles;

/// <summary>
/// An exact histogram of 64-bit integer observations (molecule counts, or differences such as A − B, so
/// any long is accepted). Frequencies are integers, so adding and merging are exact and commutative:
/// the histogram of a set of replicates is the same whatever order or thread grouping they arrive in.
/// </summary>
/// <remarks>
/// <para>Two representations, invisible in every result:</para>
/// <list type="bullet">
/// <item><b>Dense</b>: an array of frequencies over a window that covers [min, max] with some slack.
/// Adding a value inside the window is an index and an increment.</item>
/// <item><b>Sparse</b>: a hash map from value to frequency, sorted only when enumerated.</item>
/// </list>
/// <para>The rule, with d the number of distinct values and S = max − min + 1 the span, and
/// L(d) = min(2^24, max(1024, 8·d)): a value falling outside the dense window moves or enlarges the window
/// (to twice the new span when it must grow) if then S ≤ L(d), and otherwise switches the histogram to sparse. A sparse
/// histogram returns to dense when a new distinct value leaves S &lt; L(d)/4 (the factor 4 keeps a
/// histogram near the boundary from switching back and forth). The dense window never exceeds
/// max(64, 2·L(d)) slots and sparse memory is proportional to d, so memory is bounded by the number of distinct
/// values (or a few thousand slots), never by the magnitude of the counts.</para>
/// <para>Once the window has grown to fit the values seen, <see cref="Add(long)"/> allocates nothing;
/// growth is geometric, so its cost is amortised. <see cref="Clear"/> keeps a dense array for reuse.
/// Not safe for concurrent mutation; concurrent reads of an unchanging histogram are safe.</para>
/// </remarks>
public sealed class CountHistogram : IEnumerable<CountFrequency>
{
    internal const int DenseFloor = 1024;
    internal const int DensityFactor = 8;
    internal const int DenseCeiling = 1 << 24;
    internal const int ReturnFactor = 4;
    private const int MinimumCapacity = 64;

    // Invariant: in dense mode every slot outside [_minimum, _maximum] is zero.
    private long[] _dense = [];
    private long _origin;
    private Dictionary<long, long>? _sparse;
    private long _minimum;
    private long _maximum;
    private long _total;
    private int _distinct;
    private int _version;

    /// <summary>The number of observations added (the sum of all frequencies).</summary>
    public long Total => _total;

    /// <summary>The number of distinct values observed.</summary>
    public int DistinctValues => _distinct;

    /// <summary>True when nothing has been added since construction or the last <see cref="Clear"/>.</summary>
    public bool IsEmpty => _total == 0;

    /// <summary>The smallest value observed.</summary>
    /// <exception cref="InvalidOperationException">The histogram is empty.</exception>
    public long Minimum => _total > 0 ? _minimum : throw EmptyHistogram();

    /// <summary>The largest value observed.</summary>
    /// <exception cref="InvalidOperationException">The histogram is empty.</exception>
    public long Maximum => _total > 0 ? _maximum : throw EmptyHistogram();

    /// <summary>Whether the dense representation is in use (for tests of the switching rule).</summary>
    internal bool IsDense => _sparse is null;

    /// <summary>Slots held by the dense array (0 when sparse), for tests of the memory bound.</summary>
    internal int DenseCapacity => _dense.Length;

    /// <summary>L(d), the largest span the dense form may take on with d distinct values.</summary>
    internal static ulong DenseSpanLimit(long distinct) =>
        (ulong)Math.Min(DenseCeiling, Math.Max(DenseFloor, DensityFactor * distinct));

    /// <summary>Records one observation of <paramref name="value"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Add(long value) => Add(value, 1);

    /// <summary>Records <paramref name="multiplicity"/> observations of <paramref name="value"/> (0 does nothing).</summary>
    /// <exception cref="ArgumentOutOfRangeException">The multiplicity is negative.</exception>
    /// <exception cref="OverflowException">The total would exceed <see cref="long.MaxValue"/>.</exception>
    public void Add(long value, long multiplicity)
    {
        if (multiplicity <= 0)
        {
            if (multiplicity == 0) return;
            ThrowNegativeMultiplicity(multiplicity);
        }
        if (_sparse is null)
        {
            var index = unchecked((ulong)(value - _origin));
            if (index < (ulong)_dense.Length)
            {
                var total = checked(_total + multiplicity);
                ref var slot = ref _dense[(int)index];
                if (slot == 0) NoteNewValue(value);
                slot += multiplicity;
                _total = total;
                _version++;
                return;
            }
        }
        AddOutsideWindow(value, multiplicity);
    }

    /// <summary>Adds every observation of <paramref name="other"/> to this histogram (exact; <paramref name="other"/> is unchanged).</summary>
    public void Merge(CountHistogram other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (ReferenceEquals(other, this))
        {
            foreach (var bar in ToArray()) Add(bar.Value, bar.Frequency);
            return;
        }
        if (other._sparse is not null)
        {
            foreach (var (value, frequency) in other._sparse) Add(value, frequency);
            return;
        }
        if (other._total == 0) return;
        var last = (int)(other._maximum - other._origin);
        for (var i = (int)(other._minimum - other._origin); i <= last; i++)
        {
            var frequency = other._dense[i];
            if (frequency != 0) Add(other._origin + i, frequency);
        }
    }

    /// <summary>Removes every observation; a dense array is kept (zeroed) for reuse.</summary>
    public void Clear()
    {
        if (_sparse is not null) _sparse = null;
        else if (_total > 0) Array.Clear(_dense, (int)(_minimum - _origin), (int)(_maximum - _minimum) + 1);
        _total = 0;
        _distinct = 0;
        _version++;
    }

    /// <summary>How many times <paramref name="value"/> was observed (0 if never).</summary>
    public long FrequencyOf(long value)
    {
        if (_sparse is not null) return _sparse.GetValueOrDefault(value);
        var index = unchecked((ulong)(value - _origin));
        return index < (ulong)_dense.Length ? _dense[(int)index] : 0;
    }

    /// <summary>
    /// The value of the observation of 1-based rank <paramref name="rank"/> when all observations are
    /// sorted ascending (rank 1 is the minimum, rank <see cref="Total"/> the maximum).
    /// </summary>
    /// <exception cref="ArgumentOutOfRangeException">The rank is outside 1..Total.</exception>
    public long OrderStatistic(long rank)
    {
        if (rank < 1 || rank > _total)
            throw new ArgumentOutOfRangeException(nameof(rank), rank, $"a rank must be between 1 and the number of observations ({_total})");
        var cumulative = 0L;
        foreach (var bar in this)
        {
            cumulative += bar.Frequency;
            if (cumulative >= rank) return bar.Value;
        }
        throw new InvalidOperationException("the frequencies do not add up to the total");
    }

    /// <summary>
    /// The lower empirical quantile: the smallest observed v with F(v) ≥ p, F the empirical distribution
    /// function — the order statistic of rank ⌈p·n⌉ (Hyndman &amp; Fan 1996, The American Statistician
    /// 50:361, definition 1); p = 0 gives the minimum. For an even n the median (p = ½) is the lower of
    /// the two middle observations. p is a decimal so that 0.05m means exactly 1/20.
    /// </summary>
    /// <exception cref="ArgumentOutOfRangeException">p is outside [0, 1].</exception>
    /// <exception cref="InvalidOperationException">The histogram is empty.</exception>
    public long Quantile(decimal probability)
    {
        if (_total == 0) throw EmptyHistogram();
        return OrderStatistic(QuantileRank(probability, _total));
    }

    /// <summary>max(1, ⌈p·n⌉), the rank <see cref="Quantile"/> takes, exact in decimal arithmetic.</summary>
    internal static long QuantileRank(decimal probability, long count)
    {
        if (probability < 0m || probability > 1m)
            throw new ArgumentOutOfRangeException(nameof(probability), probability, "a quantile's probability must be between 0 and 1");
        return Math.Max(1L, (long)Math.Ceiling(probability * count));
    }

    /// <summary>The (value, frequency) bars in increasing order of value, as a new array.</summary>
    public CountFrequency[] ToArray()
    {
        var bars = new CountFrequency[_distinct];
        var i = 0;
        foreach (var bar in this) bars[i++] = bar;
        return bars;
    }

    /// <summary>
    /// Enumerates the (value, frequency) bars in increasing order of value; values never observed are
    /// skipped. A sparse histogram is sorted into a fresh snapshot here; a dense one allocates nothing.
    /// </summary>
    public Enumerator GetEnumerator() => new(this);

    IEnumerator<CountFrequency> IEnumerable<CountFrequency>.GetEnumerator() => GetEnumerator();

    IEnumerator IEnumerable.GetEnumerator() => GetEnumerator();

    private void NoteNewValue(long value)
    {
        _distinct++;
        if (_total == 0)
        {
            _minimum = value;
            _maximum = value;
        }
        else if (value < _minimum) _minimum = value;
        else if (value > _maximum) _maximum = value;
    }

    private void AddOutsideWindow(long value, long multiplicity)
    {
        if (_sparse is null)
        {
            var low = _total == 0 ? value : Math.Min(_minimum, value);
            var high = _total == 0 ? value : Math.Max(_maximum, value);
            // high − low as ulong is exact even when the difference exceeds long.MaxValue.
            if (unchecked((ulong)(high - low)) < DenseSpanLimit(_distinct + 1))
            {
                MoveWindow(low, high);
                Add(value, multiplicity);
                return;
            }
            SwitchToSparse();
        }
        AddSparse(value, multiplicity);
    }

    private void AddSparse(long value, long multiplicity)
    {
        var sparse = _sparse!;
        var total = checked(_total + multiplicity);
        ref var slot = ref CollectionsMarshal.GetValueRefOrAddDefault(sparse, value, out var existed);
        if (!existed) NoteNewValue(value);
        slot += multiplicity;
        _total = total;
        _version++;
        if (!existed && unchecked((ulong)(_maximum - _minimum)) < DenseSpanLimit(_distinct) / ReturnFactor) SwitchToDense();
    }

    /// <summary>
    /// Makes the dense window cover [low, high], keeping the observations. The array is reused when it
    /// has half the span again to spare, else replaced by one of twice the span; the slack is split
    /// evenly on both sides, so a run of ever larger (or smaller) values triggers only logarithmically
    /// many moves.
    /// </summary>
    private void MoveWindow(long low, long high)
    {
        var span = (int)(high - low) + 1;
        var reuse = _dense.Length >= span + span / 2;
        var capacity = reuse ? _dense.Length : Math.Max(MinimumCapacity, 2 * span);
        var origin = CentredOrigin(low, span, capacity);
        var target = reuse ? _dense : new long[capacity];
        if (_total > 0)
        {
            var length = (int)(_maximum - _minimum) + 1;
            var to = (int)(_minimum - origin);
            Array.Copy(_dense, (int)(_minimum - _origin), target, to, length);
            if (reuse)
            {
                Array.Clear(target, 0, to);
                Array.Clear(target, to + length, capacity - to - length);
            }
        }
        _dense = target;
        _origin = origin;
    }

    /// <summary>
    /// The origin that centres [low, low + span) in a window of <paramref name="capacity"/> slots,
    /// shifted to stay inside the long range at either end: a window reaching past long.MaxValue would
    /// wrap round and claim values near long.MinValue.
    /// </summary>
    private static long CentredOrigin(long low, int span, int capacity)
    {
        var below = (capacity - span) / 2;
        var origin = low < long.MinValue + below ? long.MinValue : low - below;
        return Math.Min(origin, long.MaxValue - (capacity - 1));
    }

    private void SwitchToSparse()
    {
        var sparse = new Dictionary<long, long>(Math.Max(16, 2 * _distinct));
        if (_total > 0)
        {
            var last = (int)(_maximum - _origin);
            for (var i = (int)(_minimum - _origin); i <= last; i++)
                if (_dense[i] != 0) sparse.Add(_origin + i, _dense[i]);
        }
        _sparse = sparse;
        _dense = [];
        _origin = 0;
    }

    private void SwitchToDense()
    {
        var sparse = _sparse!;
        var span = (int)(_maximum - _minimum) + 1;
        var capacity = Math.Max(MinimumCapacity, 2 * span);
        var origin = CentredOrigin(_minimum, span, capacity);
        var dense = new long[capacity];
        foreach (var (value, frequency) in sparse) dense[(int)(value - origin)] = frequency;
        _dense = dense;
        _origin = origin;
        _sparse = null;
    }

    private static InvalidOperationException EmptyHistogram() => new("the histogram is empty: no observations were added");

    [DoesNotReturn]
    private static void ThrowNegativeMultiplicity(long multiplicity) =>
        throw new ArgumentOutOfRangeException(nameof(multiplicity), multiplicity, "a multiplicity must not be negative");

    /// <summary>Walks the bars of a <see cref="CountHistogram"/> in increasing order of value.</summary>
    public struct Enumerator : IEnumerator<CountFrequency>
    {
        private readonly CountHistogram _histogram;
        private readonly int _version;
        private readonly long[]? _sortedValues;
        private readonly long[]? _sortedFrequencies;
        private readonly int _last;
        private int _position;
        private CountFrequency _current;

        internal Enumerator(CountHistogram histogram)
        {
            _histogram = histogram;
            _version = histogram._version;
            _current = default;
            if (histogram._sparse is { } sparse)
            {
                _sortedValues = new long[sparse.Count];
                _sortedFrequencies = new long[sparse.Count];
                sparse.Keys.CopyTo(_sortedValues, 0);
                sparse.Values.CopyTo(_sortedFrequencies, 0);
                Array.Sort(_sortedValues, _sortedFrequencies);
                _position = -1;
                _last = sparse.Count - 1;
            }
            else if (histogram._total > 0)
            {
                _position = (int)(histogram._minimum - histogram._origin) - 1;
                _last = (int)(histogram._maximum - histogram._origin);
            }
            else
            {
                _position = 0;
                _last = -1;
            }
        }

        /// <summary>The current bar.</summary>
        public readonly CountFrequency Current => _current;

        readonly object IEnumerator.Current => _current;

        /// <summary>Advances to the next bar; false past the last.</summary>
        /// <exception cref="InvalidOperationException">The histogram changed during the enumeration.</exception>
        public bool MoveNext()
        {
            if (_version != _histogram._version) throw new InvalidOperationException("the histogram changed while it was being enumerated");
            if (_sortedValues is not null)
            {
                if (_position >= _last) return false;
                _position++;
                _current = new CountFrequency(_sortedValues[_position], _sortedFrequencies![_position]);
                return true;
            }
            var dense = _histogram._dense;
            while (_position < _last)
            {
                _position++;
                if (dense[_position] != 0)
                {
                    _current = new CountFrequency(_histogram._origin + _position, dense[_position]);
                    return true;
                }
            }
            return false;
        }

        /// <summary>Not supported: enumerate afresh instead.</summary>
        public readonly void Reset() => throw new NotSupportedException("enumerate the histogram afresh instead of resetting");

        /// <summary>Nothing to release.</summary>
        public readonly void Dispose() { }
    }
}
