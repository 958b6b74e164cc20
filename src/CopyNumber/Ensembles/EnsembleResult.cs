using CopyNumber.Network;

namespace CopyNumber.Ensembles;

/// <summary>
/// The summaries of an ensemble: for every grid time and quantity, an exact histogram (counts) or
/// moments (real readouts). Histograms add exactly, so the result does not depend on the thread count.
/// </summary>
public sealed class EnsembleResult
{
    internal EnsembleResult(
        TimeGrid grid,
        IReadOnlyList<Quantity> quantities,
        CountHistogram[] histograms,
        MomentAccumulator[] moments,
        long replicatesFinished,
        long eventsFired,
        long replicatesStoppedEarly,
        IReadOnlyList<long> finishedBlocks,
        bool interrupted,
        TimeSpan wallTime)
    {
        Grid = grid;
        Quantities = quantities;
        CountQuantities = quantities.Where(q => q.IsCount).ToArray();
        RealQuantities = quantities.Where(q => !q.IsCount).ToArray();
        _histograms = histograms;
        _moments = moments;
        ReplicatesFinished = replicatesFinished;
        EventsFired = eventsFired;
        ReplicatesStoppedEarly = replicatesStoppedEarly;
        FinishedBlocks = finishedBlocks;
        Interrupted = interrupted;
        WallTime = wallTime;
    }

    private readonly CountHistogram[] _histograms;
    private readonly MomentAccumulator[] _moments;

    /// <summary>Recording times.</summary>
    public TimeGrid Grid { get; }

    /// <summary>All reported quantities: species, then readouts.</summary>
    public IReadOnlyList<Quantity> Quantities { get; }

    /// <summary>The quantities with exact histograms (species and integer readouts), in <see cref="Quantities"/> order.</summary>
    public IReadOnlyList<Quantity> CountQuantities { get; }

    /// <summary>The real-valued readouts, with moments only.</summary>
    public IReadOnlyList<Quantity> RealQuantities { get; }

    /// <summary>Replicates that ran to the end of the grid or stopped at a limit.</summary>
    public long ReplicatesFinished { get; }

    /// <summary>Reaction events fired over all finished replicates.</summary>
    public long EventsFired { get; }

    /// <summary>Replicates that stopped at the event limit before the final time; their later grid points are missing.</summary>
    public long ReplicatesStoppedEarly { get; }

    /// <summary>Indices of the replicate blocks finished (sorted), for resuming an interrupted run.</summary>
    public IReadOnlyList<long> FinishedBlocks { get; }

    /// <summary>True when the run was cancelled before every replicate finished.</summary>
    public bool Interrupted { get; }

    /// <summary>Wall-clock duration of the run.</summary>
    public TimeSpan WallTime { get; }

    /// <summary>The histogram of count quantity <paramref name="countQuantity"/> (index into <see cref="CountQuantities"/>) at grid point <paramref name="gridIndex"/>.</summary>
    public CountHistogram Histogram(int gridIndex, int countQuantity) => _histograms[gridIndex * CountQuantities.Count + countQuantity];

    /// <summary>The moments of real quantity <paramref name="realQuantity"/> at grid point <paramref name="gridIndex"/>.</summary>
    public MomentAccumulator Moments(int gridIndex, int realQuantity) => _moments[gridIndex * RealQuantities.Count + realQuantity];
}
