namespace CopyNumber.Ensembles;

/// <summary>
/// Takes finished blocks in any order and processes them in block order: merges real-valued readouts
/// into their moment accumulators (floating-point merges depend on order, so a fixed order keeps results
/// thread-count independent) and hands paths to the sink in replicate order. Workers wait when too many
/// blocks are pending, which bounds memory when one block is slow.
/// </summary>
internal sealed class BlockSequencer
{
    private readonly int _gridPoints;
    private readonly int _realQuantities;
    private readonly IPathSink? _paths;
    private readonly long _pathReplicates;
    private readonly IReadOnlySet<long> _skip;
    private readonly int _maxPending;
    private readonly SortedDictionary<long, ReplicateBlock> _pending = new();
    private readonly Stack<ReplicateBlock> _pool = new();
    private readonly object _gate = new();
    private long _next;

    public BlockSequencer(int gridPoints, int realQuantities, IPathSink? paths, long pathReplicates, IReadOnlySet<long> skip, int threads)
    {
        _gridPoints = gridPoints;
        _realQuantities = realQuantities;
        _paths = paths;
        _pathReplicates = paths is null ? 0 : pathReplicates;
        _skip = skip;
        _maxPending = 4 * threads;
        Moments = new MomentAccumulator[gridPoints * realQuantities];
        for (var m = 0; m < Moments.Length; m++) Moments[m] = new MomentAccumulator();
        SkipAhead();
    }

    public MomentAccumulator[] Moments { get; }

    public ReplicateBlock Rent(int blockSize, int countQuantities)
    {
        lock (_gate)
            return _pool.Count > 0 ? _pool.Pop() : new ReplicateBlock(blockSize, _gridPoints, countQuantities, _realQuantities);
    }

    public void Return(ReplicateBlock block)
    {
        lock (_gate) _pool.Push(block);
    }

    public void Submit(ReplicateBlock block, CancellationToken cancel)
    {
        lock (_gate)
        {
            _pending.Add(block.Index, block);
            Drain();
            while (_pending.Count > _maxPending && !cancel.IsCancellationRequested)
                Monitor.Wait(_gate, 100);
        }
    }

    /// <summary>Processes whatever is still pending, in order, skipping gaps left by an interruption.</summary>
    public void Flush()
    {
        lock (_gate)
        {
            while (_pending.Count > 0)
            {
                _next = _pending.Keys.First();
                Drain();
            }
        }
    }

    private void Drain()
    {
        while (_pending.Remove(_next, out var block))
        {
            Process(block);
            _pool.Push(block);
            _next++;
            SkipAhead();
            Monitor.PulseAll(_gate);
        }
    }

    private void SkipAhead()
    {
        while (_skip.Contains(_next)) _next++;
    }

    private void Process(ReplicateBlock block)
    {
        for (var slot = 0; slot < block.Length; slot++)
        {
            var points = block.RecordedPoints[slot];
            if (_realQuantities > 0)
            {
                var baseIndex = (long)slot * _gridPoints * _realQuantities;
                for (var k = 0; k < points; k++)
                    for (var q = 0; q < _realQuantities; q++)
                        Moments[k * _realQuantities + q].Add(block.Reals[baseIndex + k * _realQuantities + q]);
            }
            var replicate = block.FirstReplicate + slot;
            if (replicate < _pathReplicates)
                _paths!.Write(replicate, block.CountsOf(slot), block.CountStride, points);
        }
    }
}
