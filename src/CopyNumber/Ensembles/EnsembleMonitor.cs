namespace CopyNumber.Ensembles;

/// <summary>
/// Live counters of a running ensemble, updated by the worker threads and read by whoever draws the
/// progress display. Reads are racy snapshots, which is all a progress bar needs.
/// </summary>
public sealed class EnsembleMonitor
{
    private long _replicatesDone;
    private long _eventsFired;

    /// <summary>Replicates finished so far in this run.</summary>
    public long ReplicatesDone => Interlocked.Read(ref _replicatesDone);

    /// <summary>Reaction events fired so far in this run.</summary>
    public long EventsFired => Interlocked.Read(ref _eventsFired);

    private long _blocksDone;

    /// <summary>Blocks finished so far in this run (each counted once its replicates reached the summaries).</summary>
    public long BlocksDone => Interlocked.Read(ref _blocksDone);

    /// <summary>
    /// Called on the worker thread each time a block has reached the summaries, with the block's index;
    /// keep it short, it delays that worker. A caller can cancel the run from here.
    /// </summary>
    public Action<long>? BlockFinished { get; init; }

    internal void AddBlock(long block)
    {
        Interlocked.Increment(ref _blocksDone);
        BlockFinished?.Invoke(block);
    }

    /// <summary>Back to zero, for a run that starts over (auto's fallback from tau-leaping to the direct method).</summary>
    internal void Restart()
    {
        Interlocked.Exchange(ref _replicatesDone, 0);
        Interlocked.Exchange(ref _eventsFired, 0);
        Interlocked.Exchange(ref _blocksDone, 0);
    }

    internal void AddReplicate(long events)
    {
        Interlocked.Increment(ref _replicatesDone);
        Interlocked.Add(ref _eventsFired, events);
    }
}
