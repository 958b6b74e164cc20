using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>
/// One worker's integer sums of the mode visits of each watched species (<see cref="ModeSwitching"/>): a
/// block's replicates go to a pending part first, which joins the totals only when the whole block is
/// finished, like <see cref="SwitchingAccumulator"/>.
/// </summary>
internal sealed class ModeSwitchingAccumulator
{
    private readonly IReadOnlyList<ModeCore> _cores;
    private readonly double _span;
    private readonly Sums _total, _pending;

    public ModeSwitchingAccumulator(IReadOnlyList<ModeCore> cores, double span)
    {
        _cores = cores;
        _span = span;
        _total = new Sums(cores.Count);
        _pending = new Sums(cores.Count);
    }

    /// <summary>Forgets the pending part (a new block starts, or the last one was dropped).</summary>
    public void StartBlock() => _pending.Clear();

    /// <summary>Adds one replicate's visits to the pending part.</summary>
    public void AddReplicate(in ReplicateResult result)
    {
        var visits = result.Modes.Span;
        for (var s = 0; s < _cores.Count; s++)
        {
            if (result.HitEventLimit || s >= visits.Length)
            {
                _pending.Excluded[s]++;
                continue;
            }
            var v = visits[s];
            _pending.Replicates[s]++;
            if (v.Final < 0) _pending.NeverEntered[s]++;
            var switches = v.Switches;
            _pending.SwitchSum[s] += switches;
            _pending.SwitchSquares[s] += (Int128)switches * switches;
            _pending.Add(s, 0, Fixed(v.TimeLow), v.ExitsLow, v.Final == 0);
            _pending.Add(s, 1, Fixed(v.TimeHigh), v.ExitsHigh, v.Final == 1);
        }
    }

    // One rounding per replicate and mode: the sums of these integers are exact in any order.
    private long Fixed(double time) => (long)Math.Round(time / _span * ModeSwitching.TimeScale, MidpointRounding.ToEven);

    /// <summary>Moves the pending part into the totals: the block is finished.</summary>
    public void CommitBlock()
    {
        _total.Add(_pending);
        _pending.Clear();
    }

    /// <summary>The totals over all <paramref name="workers"/>, one entry per watched species.</summary>
    public static ModeSwitching[] Combine(IReadOnlyList<ModeSwitchingAccumulator> workers)
    {
        if (workers.Count == 0) return [];
        var first = workers[0];
        var sums = new Sums(first._cores.Count);
        foreach (var worker in workers) sums.Add(worker._total);
        return Enumerable.Range(0, first._cores.Count).Select(s =>
        {
            var core = first._cores[s];
            return new ModeSwitching(core.Name, core.Species, core.Low, core.High, first._span, sums.Replicates[s], sums.Excluded[s],
                sums.NeverEntered[s], sums.SwitchSum[s], sums.SwitchSquares[s], sums.Mode(s, 0), sums.Mode(s, 1));
        }).ToArray();
    }

    private sealed class Sums(int slots)
    {
        public readonly long[] Replicates = new long[slots];
        public readonly long[] Excluded = new long[slots];
        public readonly long[] NeverEntered = new long[slots];
        public readonly long[] SwitchSum = new long[slots];
        public readonly Int128[] SwitchSquares = new Int128[slots];
        // Per slot and mode (index 2·slot + mode).
        private readonly Int128[] _time = new Int128[2 * slots];
        private readonly Int128[] _timeSquares = new Int128[2 * slots];
        private readonly long[] _exits = new long[2 * slots];
        private readonly Int128[] _exitSquares = new Int128[2 * slots];
        private readonly Int128[] _timeExits = new Int128[2 * slots];
        private readonly long[] _censored = new long[2 * slots];

        public void Add(int slot, int mode, long time, long exits, bool censored)
        {
            var k = 2 * slot + mode;
            _time[k] += time;
            _timeSquares[k] += (Int128)time * time;
            _exits[k] += exits;
            _exitSquares[k] += (Int128)exits * exits;
            _timeExits[k] += (Int128)time * exits;
            if (censored) _censored[k]++;
        }

        public ModeSums Mode(int slot, int mode)
        {
            var k = 2 * slot + mode;
            return new ModeSums(_time[k], _timeSquares[k], _exits[k], _exitSquares[k], _timeExits[k], _censored[k]);
        }

        public void Clear()
        {
            foreach (var array in new Array[] { Replicates, Excluded, NeverEntered, SwitchSum, SwitchSquares, _time, _timeSquares, _exits, _exitSquares, _timeExits, _censored })
                Array.Clear(array);
        }

        public void Add(Sums other)
        {
            for (var s = 0; s < Replicates.Length; s++)
            {
                Replicates[s] += other.Replicates[s];
                Excluded[s] += other.Excluded[s];
                NeverEntered[s] += other.NeverEntered[s];
                SwitchSum[s] += other.SwitchSum[s];
                SwitchSquares[s] += other.SwitchSquares[s];
            }
            for (var k = 0; k < _time.Length; k++)
            {
                _time[k] += other._time[k];
                _timeSquares[k] += other._timeSquares[k];
                _exits[k] += other._exits[k];
                _exitSquares[k] += other._exitSquares[k];
                _timeExits[k] += other._timeExits[k];
                _censored[k] += other._censored[k];
            }
        }
    }
}
