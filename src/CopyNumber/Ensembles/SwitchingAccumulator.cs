using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>
/// One worker's integer sums of the switches of each two-state species (<see cref="SwitchingStatistics"/>):
/// a block's replicates go to a pending part first, which joins the totals only when the whole block is
/// finished, like the histograms.
/// </summary>
internal sealed class SwitchingAccumulator
{
    private readonly TwoStateSpecies _twoState;
    private readonly IReadOnlyList<string> _names;
    private readonly double _span;
    private readonly Sums _total, _pending;

    public SwitchingAccumulator(ReactionNetwork network, double span)
    {
        _twoState = TwoStateSpecies.Of(network);
        _names = network.Species;
        _span = span;
        _total = new Sums(_twoState.Count);
        _pending = new Sums(_twoState.Count);
    }

    /// <summary>Forgets the pending part (a new block starts, or the last one was dropped).</summary>
    public void StartBlock() => _pending.Clear();

    /// <summary>Adds one replicate's switches to the pending part.</summary>
    public void AddReplicate(in ReplicateResult result)
    {
        var switches = result.Switches.Span;
        for (var s = 0; s < _pending.Count.Length; s++)
        {
            var value = s < switches.Length ? switches[s] : -1;
            if (result.HitEventLimit || value < 0)
            {
                _pending.Excluded[s]++;
                continue;
            }
            _pending.Count[s]++;
            _pending.Sum[s] += value;
            _pending.SumOfSquares[s] += (Int128)value * value;
        }
    }

    /// <summary>Moves the pending part into the totals: the block is finished.</summary>
    public void CommitBlock()
    {
        _total.Add(_pending);
        _pending.Clear();
    }

    /// <summary>The totals over all <paramref name="workers"/>, one entry per two-state species.</summary>
    public static SwitchingStatistics[] Combine(IReadOnlyList<SwitchingAccumulator> workers)
    {
        if (workers.Count == 0) return [];
        var first = workers[0];
        var sums = new Sums(first._twoState.Count);
        foreach (var worker in workers) sums.Add(worker._total);
        return Enumerable.Range(0, first._twoState.Count).Select(s =>
        {
            var species = first._twoState.Species[s];
            return new SwitchingStatistics(first._names[species], species, first._span, sums.Count[s], sums.Sum[s], sums.SumOfSquares[s], sums.Excluded[s]);
        }).ToArray();
    }

    private sealed class Sums(int slots)
    {
        public readonly long[] Count = new long[slots];
        public readonly long[] Sum = new long[slots];
        public readonly Int128[] SumOfSquares = new Int128[slots];
        public readonly long[] Excluded = new long[slots];

        public void Clear()
        {
            Array.Clear(Count);
            Array.Clear(Sum);
            Array.Clear(SumOfSquares);
            Array.Clear(Excluded);
        }

        public void Add(Sums other)
        {
            for (var s = 0; s < Count.Length; s++)
            {
                Count[s] += other.Count[s];
                Sum[s] += other.Sum[s];
                SumOfSquares[s] += other.SumOfSquares[s];
                Excluded[s] += other.Excluded[s];
            }
        }
    }
}
