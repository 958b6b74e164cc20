using CopyNumber.Network;

namespace CopyNumber.Ensembles;

/// <summary>
/// How much memory an ensemble will need, estimated before it starts so that a grid too fine for the
/// machine is refused with a number instead of failing half-way. The figures are upper estimates of the
/// large arrays (the per-event loop allocates nothing, so these dominate); object headers and the
/// runtime's own needs come on top.
/// </summary>
/// <param name="PerThreadBytes">One worker: its staged block (block size × grid × quantities × 8 bytes), its histograms and its simulator (<paramref name="SimulatorBytes"/>).</param>
/// <param name="SharedBytes">The merged histograms, the moment tree (real readouts and species pairs' sums) and blocks waiting for their paths to be written.</param>
/// <param name="Threads">Worker threads the estimate is for: the threads asked for, or the blocks to run when fewer.</param>
/// <param name="BlockElements">Elements of the largest staged-block array; .NET arrays hold at most <see cref="Array.MaxLength"/>.</param>
/// <param name="SimulatorBytes">
/// One worker's simulator, which grows with the network, not the grid: counts, propensity terms, the
/// firing program with its update records (one per stored dependency-graph entry) and the selection
/// structure (<see cref="SimulatorBytesFor"/>).
/// </param>
public sealed record EnsembleMemory(long PerThreadBytes, long SharedBytes, int Threads, long BlockElements, long SimulatorBytes = 0)
{
    /// <summary>Bytes of one histogram with its smallest dense window (64 slots of 8 bytes) and its object.</summary>
    internal const long HistogramBytes = 64 * 8 + 96;

    /// <summary>Bytes of one moment accumulator and the reference to it.</summary>
    internal const long AccumulatorBytes = 72;

    /// <summary>The whole estimate in bytes.</summary>
    public long TotalBytes => Saturating(PerThreadBytes, Threads, SharedBytes);

    /// <summary>False when a staged block would be larger than one .NET array can be, whatever the memory.</summary>
    public bool FitsArrays => BlockElements <= Array.MaxLength;

    /// <summary>The estimate for <paramref name="network"/> run with <paramref name="options"/>.</summary>
    public static EnsembleMemory For(ReactionNetwork network, EnsembleOptions options)
    {
        ArgumentNullException.ThrowIfNull(network);
        ArgumentNullException.ThrowIfNull(options);
        var quantities = Quantity.Of(network);
        long counts = quantities.Count(q => q.IsCount);
        long reals = quantities.Count - counts;
        // The moment tree's cells per grid point: the real readouts and the species pairs' sums (covariances).
        long treeCells = reals + (options.CovariancePairs ?? SpeciesPair.Default(network)).Count;
        long grid = options.Grid.Count;
        long block = Math.Max(1, options.BlockSize);
        // No more workers start than there are blocks to run.
        var (first, end) = options.Shard.IsValid ? options.Shard.Blocks(options.TotalBlocks) : (0, options.TotalBlocks);
        var threads = (int)Math.Clamp(end - first, 1, Math.Max(1, options.Threads));
        var blockElements = Math.Max(Product(block, grid, counts), Product(block, grid, reals));
        var blockBytes = Saturating(Product(block, grid, counts + reals), 8, block * 4);
        var simulator = SimulatorBytesFor(network);
        var perThread = Saturating(Saturating(blockBytes, 1, Product(grid, counts, HistogramBytes) + Product(grid, treeCells, AccumulatorBytes)), 1, simulator);
        // Blocks holding path replicates may wait, up to four per thread, for the ones before them.
        var waiting = options.PathReplicates > 0 ? Saturating(blockBytes, 4L * threads, 0) : 0;
        var height = 0;
        while ((1L << height) < Math.Max(1, options.TotalBlocks)) height++;
        var tree = Product(height + 1 + threads, Product(grid, treeCells, AccumulatorBytes), 1);
        var shared = Saturating(Product(grid, counts, HistogramBytes), 1, Saturating(waiting, 1, tree));
        return new EnsembleMemory(perThread, shared, threads, blockElements, simulator);
    }

    /// <summary>
    /// Upper estimate of one simulator's arrays for <paramref name="network"/>, in bytes: per reaction its
    /// term, constant, program header, selection entry and scratch (≤ 128 bytes); per species its count and
    /// reader-row start (16); per entry of N its change record (36); per stored dependency-graph entry an
    /// update record of 32 bytes and its index (36). Linear in the network, as the graph is.
    /// </summary>
    public static long SimulatorBytesFor(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var n = network.Stoichiometry;
        long changes = 0;
        for (var j = 0; j < n.ReactionCount; j++) changes += n.ChangedSpecies(j).Length;
        return 128L * n.ReactionCount + 16L * n.SpeciesCount + 36 * changes + 36 * network.Dependencies.StoredEntries;
    }

    /// <summary>
    /// Why the run would not fit, in words for the user, or null when it fits: a staged block larger
    /// than one array can be, or an estimate above 80 % of <paramref name="availableBytes"/> (the rest is
    /// left for the runtime, the model and the output buffers).
    /// </summary>
    public string? Problem(long availableBytes)
    {
        if (!FitsArrays)
            return $"the time grid is too fine for blocks of replicates: one block would hold {BlockElements:N0} values, more than the {Array.MaxLength:N0} one array can; choose a larger --every";
        if (TotalBytes <= availableBytes / 5 * 4) return null;
        if (SimulatorBytes >= PerThreadBytes / 2)
            return $"the network is too large for the memory: each of {Threads} threads needs about {Describe(SimulatorBytes)} for its simulator " +
                $"(the run about {Describe(TotalBytes)} in all), but about {Describe(availableBytes)} is available; choose fewer --threads or a smaller network";
        return $"the run would need about {Describe(TotalBytes)} of memory ({Describe(PerThreadBytes)} for each of {Threads} threads and {Describe(SharedBytes)} shared), " +
            $"but about {Describe(availableBytes)} is available; choose a larger --every or fewer --threads";
    }

    /// <summary>"12.3 GB", "456 MB": a size for a message.</summary>
    public static string Describe(long bytes) =>
        bytes >= 1L << 30 ? $"{bytes / (double)(1L << 30):0.0} GB" : $"{Math.Max(1, bytes / (1L << 20))} MB";

    private static long Product(long a, long b, long c)
    {
        var p = (Int128)a * b * c;
        return p > long.MaxValue ? long.MaxValue : (long)p;
    }

    private static long Saturating(long a, long times, long plus)
    {
        var p = (Int128)a * times + plus;
        return p > long.MaxValue ? long.MaxValue : (long)p;
    }
}
