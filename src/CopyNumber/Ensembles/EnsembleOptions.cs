using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Ensembles;

/// <summary>What an ensemble run does. Replicate r always uses the stream (Seed, r), whatever the threads.</summary>
public sealed record EnsembleOptions
{
    /// <summary>Recording times.</summary>
    public required TimeGrid Grid { get; init; }

    /// <summary>Number of replicates in the whole run (all shards together).</summary>
    public required long Replicates { get; init; }

    /// <summary>Run seed; replicate r's generator is <see cref="Randomness.ReplicateStreams.For"/>(Seed, r).</summary>
    public required ulong Seed { get; init; }

    /// <summary>Which simulator.</summary>
    public SimulationMethod Method { get; init; } = SimulationMethod.Direct;

    /// <summary>Simulator settings (ε for tau-leaping, event limit per replicate).</summary>
    public SimulatorOptions Simulator { get; init; } = new();

    /// <summary>Worker threads (≥ 1).</summary>
    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>The first this many replicates have their paths handed to the path sink, in replicate order.</summary>
    public long PathReplicates { get; init; }

    /// <summary>
    /// Replicates are handed out in blocks of this many; a block is the unit that is finished or, on
    /// interruption, dropped whole, so the finished replicates are always a known set of blocks.
    /// </summary>
    public int BlockSize { get; init; } = DefaultBlockSize;

    /// <summary>
    /// g, replicates that share one draw of the parameters that vary (<see cref="Network.ParameterVariability"/>):
    /// replicates d·g … d·g + g − 1 share draw d. Used only when some parameter varies; then it must be at
    /// least 2 and divide <see cref="BlockSize"/> at most half (so a group never straddles a block or a shard,
    /// and groups pair inside a block for <see cref="NoiseDecomposition"/>).
    /// </summary>
    public int ReplicatesPerDraw { get; init; } = DefaultReplicatesPerDraw;

    /// <summary>
    /// The species pairs whose covariance is accumulated at every grid time; null for <see cref="SpeciesPair.Default"/>
    /// (every pair of a network of at most <see cref="SpeciesPair.AllPairsUpTo"/> species, none beyond), empty for none.
    /// </summary>
    public IReadOnlyList<SpeciesPair>? CovariancePairs { get; init; }

    /// <summary>The nested design's default group size.</summary>
    public const int DefaultReplicatesPerDraw = 8;

    /// <summary>
    /// Whether <paramref name="replicatesPerDraw"/> replicates per draw suit blocks of <paramref name="blockSize"/>: at least 2,
    /// and two groups fit a block a whole number of times (so groups never straddle a block or a shard, and pair inside one).
    /// </summary>
    public static bool FitsBlock(int replicatesPerDraw, int blockSize) =>
        replicatesPerDraw >= 2 && replicatesPerDraw <= blockSize / 2 && blockSize % (2 * replicatesPerDraw) == 0;

    /// <summary>The block size runs use unless told otherwise.</summary>
    public const int DefaultBlockSize = 64;

    /// <summary>Blocks already finished by an earlier, interrupted run; they are skipped.</summary>
    public IReadOnlySet<long> SkipBlocks { get; init; } = new HashSet<long>();

    /// <summary>Which part of the run's blocks this process runs; <see cref="Shard.Whole"/> for all of them.</summary>
    public Shard Shard { get; init; } = Shard.Whole;

    /// <summary>B = ⌈<see cref="Replicates"/> / <see cref="BlockSize"/>⌉, the blocks of the whole run (all shards).</summary>
    public long TotalBlocks => BlockRanges.BlocksFor(Replicates, BlockSize);
}
