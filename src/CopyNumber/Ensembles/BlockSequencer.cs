namespace CopyNumber.Ensembles;

/// <summary>
/// Lends out replicate blocks, and hands the paths of the blocks that hold path replicates to the sink
/// in replicate order whichever thread finished them first. Workers wait when too many such blocks are
/// pending, which bounds memory when one block is slow. Only the first ⌈paths / block size⌉ blocks
/// are ever ordered; every other block goes straight back to the pool.
/// </summary>
internal sealed class BlockSequencer
{
    private readonly int _gridPoints;
    private readonly int _countQuantities;
    private readonly int _realQuantities;
    private readonly int _blockSize;
    private readonly IPathSink? _paths;
    private readonly long _pathReplicates;
    private readonly long _pathBlocksEnd;
    private readonly Func<long, bool> _runs;
    private readonly int _maxPending;
    private readonly SortedDictionary<long, ReplicateBlock> _pending = new();
    private readonly Stack<ReplicateBlock> _pool = new();
    private readonly object _gate = new();
    private readonly HashSet<long> _writtenEarly = [];
    private long _next;
    private bool _closed;

    /// <param name="gridPoints">Grid points per replicate.</param>
    /// <param name="countQuantities">Count quantities per grid point.</param>
    /// <param name="realQuantities">Real readouts per grid point.</param>
    /// <param name="blockSize">Replicates per block.</param>
    /// <param name="paths">Where paths go, or null.</param>
    /// <param name="pathReplicates">The first this many replicates have their paths written.</param>
    /// <param name="firstBlock">The first block this run may run.</param>
    /// <param name="runs">Whether this run runs a given block (false for skipped blocks and other shards).</param>
    /// <param name="threads">Worker threads; up to four blocks per thread may wait.</param>
    public BlockSequencer(int gridPoints, int countQuantities, int realQuantities, int blockSize, IPathSink? paths, long pathReplicates, long firstBlock, Func<long, bool> runs, int threads)
    {
        _gridPoints = gridPoints;
        _countQuantities = countQuantities;
        _realQuantities = realQuantities;
        _blockSize = blockSize;
        _paths = paths;
        _pathReplicates = paths is null ? 0 : pathReplicates;
        _pathBlocksEnd = _pathReplicates / blockSize + (_pathReplicates % blockSize == 0 ? 0 : 1);
        _runs = runs;
        _maxPending = 4 * threads;
        _next = firstBlock;
        SkipAhead();
    }

    public ReplicateBlock Rent()
    {
        lock (_gate)
            return _pool.Count > 0 ? _pool.Pop() : new ReplicateBlock(_blockSize, _gridPoints, _countQuantities, _realQuantities);
    }

    public void Return(ReplicateBlock block)
    {
        lock (_gate) _pool.Push(block);
    }

    /// <summary>Takes a finished block: its paths are written now or once the blocks before it are in.</summary>
    public void Submit(ReplicateBlock block)
    {
        lock (_gate)
        {
            if (_closed) return;
            if (block.Index >= _pathBlocksEnd)
            {
                _pool.Push(block);
                return;
            }
            _pending.Add(block.Index, block);
            Drain();
        }
    }

    /// <summary>Waits while too many blocks are pending, or until <paramref name="cancel"/> fires.</summary>
    public void WaitForRoom(CancellationToken cancel)
    {
        lock (_gate)
        {
            while (_pending.Count > _maxPending && !cancel.IsCancellationRequested && !_closed)
                Monitor.Wait(_gate, 100);
        }
    }

    /// <summary>
    /// Writes the paths of every block pending (in order, leaving the gaps before them), so that the
    /// path sink then holds the paths of every finished block: a checkpoint needs that. The gaps are
    /// written when their blocks arrive, in order again, so the paths written after this call are
    /// themselves in replicate order (a new part for a sink that keeps parts).
    /// </summary>
    public void WritePending()
    {
        lock (_gate)
        {
            foreach (var (index, block) in _pending)
            {
                Process(block);
                _pool.Push(block);
                _writtenEarly.Add(index);
            }
            _pending.Clear();
            Monitor.PulseAll(_gate);
        }
    }

    /// <summary>
    /// Writes whatever is still pending, in order, skipping the gaps an interruption left; afterwards
    /// blocks submitted by workers that were abandoned still running are ignored.
    /// </summary>
    public void Flush()
    {
        lock (_gate)
        {
            while (_pending.Count > 0)
            {
                _next = _pending.Keys.First();
                Drain();
            }
            _closed = true;
            Monitor.PulseAll(_gate);
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
        while (_next < _pathBlocksEnd && (!_runs(_next) || _writtenEarly.Remove(_next))) _next++;
    }

    private void Process(ReplicateBlock block)
    {
        for (var slot = 0; slot < block.Length; slot++)
        {
            var replicate = block.FirstReplicate + slot;
            if (replicate < _pathReplicates)
                _paths!.Write(replicate, block.CountsOf(slot), block.CountStride, block.RecordedPoints[slot]);
        }
    }
}
