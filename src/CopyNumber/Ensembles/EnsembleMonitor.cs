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

    internal void AddReplicate(long events)
    {
        Interlocked.Increment(ref _replicatesDone);
        Interlocked.Add(ref _eventsFired, events);
    }
}
