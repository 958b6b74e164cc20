using CopyNumber.Network;

namespace CopyNumber.Ensembles;

/// <summary>
/// The summaries of an ensemble: for every grid time and quantity, an exact histogram (counts) or
/// moments (real readouts), over the replicate blocks finished. Histograms add exactly and real
/// moments are combined in a fixed tree over the blocks (<see cref="MomentTree"/>), so the result
/// does not depend on the thread count, and results over disjoint blocks combine
/// (<see cref="Combine"/>) into exactly what one run over all of them gives.
/// </summary>
public sealed class EnsembleResult
{
    private readonly CountHistogram[] _histograms;
    private MomentAccumulator[]? _moments;
    private NoiseDecomposition? _noise;

    internal EnsembleResult(
        TimeGrid grid,
        IReadOnlyList<Quantity> quantities,
        CountHistogram[] histograms,
        MomentTree momentTree,
        long replicatesFinished,
        long eventsFired,
        long replicatesStoppedEarly,
        IReadOnlyList<long> finishedBlocks,
        int blockSize,
        long replicatesRequested,
        Shard shard,
        bool interrupted,
        TimeSpan wallTime,
        IReadOnlyList<SwitchingStatistics>? switching = null,
        IReadOnlyList<SpeciesPair>? pairs = null,
        int replicatesPerDraw = 0)
    {
        Grid = grid;
        Quantities = quantities;
        CountQuantities = quantities.Where(q => q.IsCount).ToArray();
        RealQuantities = quantities.Where(q => !q.IsCount).ToArray();
        if (histograms.Length != grid.Count * CountQuantities.Count) throw new ArgumentException("one histogram per grid point and count quantity is needed", nameof(histograms));
        Pairs = pairs ?? [];
        ReplicatesPerDraw = replicatesPerDraw;
        if (momentTree.Cells != grid.Count * CellsPerPoint)
            throw new ArgumentException("the moment tree needs one cell per grid point and real readout or species pair, and two per quantity for a noise decomposition", nameof(momentTree));
        _histograms = histograms;
        MomentTree = momentTree;
        ReplicatesFinished = replicatesFinished;
        EventsFired = eventsFired;
        ReplicatesStoppedEarly = replicatesStoppedEarly;
        FinishedBlocks = finishedBlocks;
        BlockSize = blockSize;
        ReplicatesRequested = replicatesRequested;
        Shard = shard;
        WallTime = wallTime;
        Interrupted = interrupted;
        Switching = switching ?? [];
    }

    /// <summary>Recording times.</summary>
    public TimeGrid Grid { get; }

    /// <summary>
    /// Intrinsic and extrinsic parts of each quantity's variance over the finished blocks, when some parameter varies
    /// (<see cref="ReplicatesPerDraw"/> &gt; 0); null otherwise. A shard, a merge and a resumed run carry it exactly.
    /// </summary>
    public NoiseDecomposition? Noise => ReplicatesPerDraw == 0 ? null
        : _noise ??= NoiseDecomposition.FromTree(ReplicatesPerDraw, Grid.Count, NoiseQuantities, Summary, RealQuantities.Count + Pairs.Count, CellsPerPoint);

    /// <summary>g, the replicates that share one draw of the varying parameters in the nested design; 0 when no parameter varies.</summary>
    public int ReplicatesPerDraw { get; }

    // The decomposition's quantities: counts first, then real ones (the block's own layout).
    private Quantity[] NoiseQuantities => [.. CountQuantities, .. RealQuantities];

    // Cells of the moment tree per grid point: real readouts, species pairs' sums, then the decomposition's estimators.
    private int CellsPerPoint => RealQuantities.Count + Pairs.Count + (ReplicatesPerDraw > 0 ? NoiseDecomposition.CellsPerPoint(Quantities.Count) : 0);

    private MomentAccumulator[] Summary => _moments ??= MomentTree.Summarise();

    /// <summary>All reported quantities: species, then readouts.</summary>
    public IReadOnlyList<Quantity> Quantities { get; }

    /// <summary>The quantities with exact histograms (species and integer readouts), in <see cref="Quantities"/> order.</summary>
    public IReadOnlyList<Quantity> CountQuantities { get; }

    /// <summary>The real-valued readouts, with moments only.</summary>
    public IReadOnlyList<Quantity> RealQuantities { get; }

    /// <summary>Replicates in the finished blocks: those that ran to the end of the grid or stopped at the event limit.</summary>
    public long ReplicatesFinished { get; }

    /// <summary>Reaction events fired over all finished replicates.</summary>
    public long EventsFired { get; }

    /// <summary>Replicates that stopped at the event limit before the final time; their later grid points are missing.</summary>
    public long ReplicatesStoppedEarly { get; }

    /// <summary>Indices of the replicate blocks finished (sorted), for resuming an interrupted run or merging shards.</summary>
    public IReadOnlyList<long> FinishedBlocks { get; }

    /// <summary>Replicates per block (the last block of the run may be shorter).</summary>
    public int BlockSize { get; }

    /// <summary>Replicates of the whole run, all shards together.</summary>
    public long ReplicatesRequested { get; }

    /// <summary>B, the blocks of the whole run.</summary>
    public long TotalBlocks => MomentTree.TotalBlocks;

    /// <summary>The part of the run this result is responsible for.</summary>
    public Shard Shard { get; }

    /// <summary>
    /// True when a block this result was to hold is not finished: the run was cancelled, reached its
    /// wall-clock limit or failed before the end (the blocks a run was told to skip do not count; a
    /// combination was to hold every block of its <see cref="Shard"/>). The summaries then cover the
    /// finished blocks only.
    /// </summary>
    public bool Interrupted { get; }

    /// <summary>True when every block of the whole run is finished.</summary>
    public bool IsComplete => FinishedBlocks.Count == TotalBlocks;

    /// <summary>Wall-clock duration of the run (for a combination, the sum of its parts).</summary>
    public TimeSpan WallTime { get; }

    /// <summary>
    /// Switches per replicate over [0, T] of each species the model confines to 0 and 1 (empty when it
    /// has none), counted at the events; see <see cref="SwitchingStatistics"/> and
    /// <see cref="Network.TwoStateSpecies"/>.
    /// </summary>
    public IReadOnlyList<SwitchingStatistics> Switching { get; }

    /// <summary>
    /// Switching between the low and high modes of each species given cores (<see cref="Stochastic.SimulatorOptions.Modes"/>;
    /// empty without), counted at the events; see <see cref="Ensembles.ModeSwitching"/>.
    /// </summary>
    public IReadOnlyList<ModeSwitching> ModeSwitching { get; init; } = [];

    /// <summary>
    /// The species pairs whose covariance is accumulated (<see cref="Covariance"/>): the moments of each pair's sum x + y
    /// are cells of <see cref="MomentTree"/>, after the real readouts at each grid point.
    /// </summary>
    public IReadOnlyList<SpeciesPair> Pairs { get; }

    /// <summary>
    /// The real readouts' moments, then the species pairs' sums, over the finished blocks, in their fixed combination order;
    /// <see cref="MomentTree.Cells"/> = grid points × (real readouts + pairs), grid point major.
    /// </summary>
    public MomentTree MomentTree { get; }

    /// <summary>The histogram of count quantity <paramref name="countQuantity"/> (index into <see cref="CountQuantities"/>) at grid point <paramref name="gridIndex"/>.</summary>
    public CountHistogram Histogram(int gridIndex, int countQuantity) => _histograms[gridIndex * CountQuantities.Count + countQuantity];

    /// <summary>The moments of real quantity <paramref name="realQuantity"/> at grid point <paramref name="gridIndex"/>.</summary>
    public MomentAccumulator Moments(int gridIndex, int realQuantity)
    {
        return Summary[gridIndex * CellsPerPoint + realQuantity];
    }

    /// <summary>
    /// The covariance of pair <paramref name="pair"/> (index into <see cref="Pairs"/>) at grid point <paramref name="gridIndex"/>,
    /// from the identity Cov(x, y) = (Var(x + y) − Var x − Var y)/2 with the unbiased variances of the sum's moments and of
    /// the two species' exact histograms (docs/methods.md, "Covariances between species").
    /// </summary>
    public CovarianceEstimate Covariance(int gridIndex, int pair)
    {
        var sum = Moments(gridIndex, RealQuantities.Count + pair);
        var (a, b) = (Pairs[pair].First, Pairs[pair].Second);
        var x = Histogram(gridIndex, CountIndexOfSpecies(a));
        var y = Histogram(gridIndex, CountIndexOfSpecies(b));
        return CovarianceEstimate.Of(sum, x, y);
    }

    /// <summary>
    /// The names of the moment tree's cells at one grid point: the real readouts, then each pair's sum as "U+V" (a species
    /// name never holds '+'), the names under which readout-state.parquet stores them.
    /// </summary>
    public IReadOnlyList<string> TreeCellNames => CellNames(Quantities, Pairs, ReplicatesPerDraw);

    /// <summary>
    /// The names of the moment tree's cells at one grid point for a run reporting <paramref name="quantities"/>, accumulating
    /// <paramref name="pairs"/> and, when <paramref name="replicatesPerDraw"/> &gt; 0, a noise decomposition: the real readouts,
    /// each pair's sum as "U+V" (a species name never holds '+'), then "X/intrinsic" and "X/extrinsic" per quantity, counts
    /// first. These are the names under which readout-state.parquet stores the cells.
    /// </summary>
    public static IReadOnlyList<string> CellNames(IReadOnlyList<Quantity> quantities, IReadOnlyList<SpeciesPair> pairs, int replicatesPerDraw)
    {
        ArgumentNullException.ThrowIfNull(quantities);
        ArgumentNullException.ThrowIfNull(pairs);
        var reals = quantities.Where(q => !q.IsCount);
        IEnumerable<string> names = [.. reals.Select(q => q.Name), .. pairs.Select(p => SpeciesPair.SumName(quantities[p.First].Name, quantities[p.Second].Name))];
        if (replicatesPerDraw > 0) names = names.Concat(NoiseDecomposition.CellNames([.. quantities.Where(q => q.IsCount), .. reals]));
        return [.. names];
    }

    // Species come first among the count quantities, in network order.
    private int CountIndexOfSpecies(int species) => species;

    /// <summary>
    /// The result over the blocks of both <paramref name="first"/> and <paramref name="second"/>, which must
    /// come from the same model, grid, seed and settings and share no block. Exact: histograms add and
    /// real moments are combined in the same fixed tree one run over all the blocks uses, so the result
    /// equals bit for bit that of one run. It is responsible for their common shard, or for the whole run
    /// when they differ.
    /// </summary>
    /// <exception cref="ArgumentException">The results differ in shape or share a block.</exception>
    public static EnsembleResult Combine(EnsembleResult first, EnsembleResult second)
    {
        ArgumentNullException.ThrowIfNull(first);
        ArgumentNullException.ThrowIfNull(second);
        if (first.Grid.Count != second.Grid.Count || first.Grid.Until != second.Grid.Until || first.Grid.Every != second.Grid.Every)
            throw new ArgumentException("the results have different time grids", nameof(second));
        if (!first.Quantities.Select(q => (q.Name, q.IsCount)).SequenceEqual(second.Quantities.Select(q => (q.Name, q.IsCount))))
            throw new ArgumentException("the results report different quantities", nameof(second));
        if (first.BlockSize != second.BlockSize || first.ReplicatesRequested != second.ReplicatesRequested)
            throw new ArgumentException("the results come from runs of different sizes", nameof(second));
        var shared = first.FinishedBlocks.Intersect(second.FinishedBlocks).Take(1).ToArray();
        if (shared.Length > 0) throw new ArgumentException($"both results hold block {shared[0]}", nameof(second));

        var histograms = new CountHistogram[first._histograms.Length];
        for (var h = 0; h < histograms.Length; h++)
        {
            histograms[h] = new CountHistogram();
            histograms[h].Merge(first._histograms[h]);
            histograms[h].Merge(second._histograms[h]);
        }
        if (!first.Pairs.SequenceEqual(second.Pairs)) throw new ArgumentException("the results accumulate different species pairs", nameof(second));
        if (first.ReplicatesPerDraw != second.ReplicatesPerDraw) throw new ArgumentException("the results group their replicates differently per draw of the varying parameters", nameof(second));
        var tree = new MomentTree(first.TotalBlocks, first.MomentTree.Cells);
        tree.AddCopiesOf(first.MomentTree);
        tree.AddCopiesOf(second.MomentTree);
        var finished = first.FinishedBlocks.Concat(second.FinishedBlocks).Order().ToArray();
        var shard = first.Shard == second.Shard ? first.Shard : Shard.Whole;
        return new EnsembleResult(
            first.Grid, first.Quantities, histograms, tree,
            first.ReplicatesFinished + second.ReplicatesFinished,
            first.EventsFired + second.EventsFired,
            first.ReplicatesStoppedEarly + second.ReplicatesStoppedEarly,
            finished, first.BlockSize, first.ReplicatesRequested, shard,
            !Covers(finished, shard.Blocks(first.TotalBlocks)),
            first.WallTime + second.WallTime,
            CombineSwitching(first.Switching, second.Switching), first.Pairs, first.ReplicatesPerDraw)
        {
            ModeSwitching = CombineModes(first.ModeSwitching, second.ModeSwitching),
        };
    }

    private static ModeSwitching[] CombineModes(IReadOnlyList<ModeSwitching> first, IReadOnlyList<ModeSwitching> second)
    {
        // A part without the statistics (stored before they existed, or its record unreadable) would make the sum wrong: none is given.
        if (first.Count != second.Count) return [];
        return first.Zip(second, (a, b) => a.Add(b)).ToArray();
    }

    private static SwitchingStatistics[] CombineSwitching(IReadOnlyList<SwitchingStatistics> first, IReadOnlyList<SwitchingStatistics> second)
    {
        // A part may lack the statistics (a run stored before they existed): the sum would then be wrong, so none is given.
        if (first.Count != second.Count) return [];
        return first.Zip(second, (a, b) => a.Add(b)).ToArray();
    }

    /// <summary>True when the sorted <paramref name="blocks"/> include every block of [First, End).</summary>
    internal static bool Covers(IReadOnlyList<long> blocks, (long First, long End) range) =>
        blocks.Count(b => b >= range.First && b < range.End) == range.End - range.First;
}
