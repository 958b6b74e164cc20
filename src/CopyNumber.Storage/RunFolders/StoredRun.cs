using System.Globalization;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// A run folder read back: its manifest, and on request its summaries as an <see cref="EnsembleResult"/>
/// (histograms from the frequencies of <c>distributions.parquet</c>, real moments from
/// <c>readout-state.parquet</c>), so that it can be resumed or merged exactly. Every file records the
/// finished blocks it covers; they must agree with the manifest, which is written last, so a folder
/// whose writing was cut short is refused rather than counted twice.
/// </summary>
public sealed class StoredRun
{
    private StoredRun(string folder, RunManifest manifest, int blockSize, long totalBlocks, Shard shard, long[] finishedBlocks, TimeGrid grid)
    {
        Folder = folder;
        Manifest = manifest;
        BlockSize = blockSize;
        TotalBlocks = totalBlocks;
        Shard = shard;
        FinishedBlocks = finishedBlocks;
        Grid = grid;
    }

    /// <summary>The folder, as a full path.</summary>
    public string Folder { get; }

    /// <summary>Its manifest.</summary>
    public RunManifest Manifest { get; }

    /// <summary>Replicates per block.</summary>
    public int BlockSize { get; }

    /// <summary>Blocks of the whole run.</summary>
    public long TotalBlocks { get; }

    /// <summary>The part of the run the folder is responsible for.</summary>
    public Shard Shard { get; }

    /// <summary>Blocks finished, sorted.</summary>
    public IReadOnlyList<long> FinishedBlocks { get; }

    /// <summary>The run's time grid.</summary>
    public TimeGrid Grid { get; }

    /// <summary>True when a block of <see cref="Shard"/> is not finished.</summary>
    public bool IsPartial => !EnsembleResult.Covers(FinishedBlocks, Shard.Blocks(TotalBlocks));

    /// <summary>Reads <paramref name="folder"/>/manifest.json and checks it describes a resumable run.</summary>
    /// <exception cref="RunFolderException">The folder or its manifest is missing, or the manifest lacks a field.</exception>
    public static StoredRun Open(string folder)
    {
        ArgumentNullException.ThrowIfNull(folder);
        var full = AtomicFile.FullPath(folder);
        if (!Directory.Exists(full)) throw new RunFolderException($"The run folder '{full}' does not exist.", full);
        var manifestPath = Path.Combine(full, RunFiles.Manifest);
        if (!File.Exists(manifestPath)) throw new RunFolderException($"'{full}' holds no {RunFiles.Manifest}, so it is not a CopyNumber run folder (or its run never got as far as writing one).", full);
        RunManifest manifest;
        try
        {
            manifest = RunManifest.Read(manifestPath);
        }
        catch (OutputException e)
        {
            throw new RunFolderException(e.Message, full, e);
        }

        string Field(string key) =>
            manifest.ExtraText(key) ?? throw new RunFolderException($"The manifest of '{full}' has no '{key}' field; it was written by another version of CopyNumber or edited, and cannot be resumed or merged.", full);
        string Argument(string key) =>
            manifest.Arguments.TryGetValue(key, out var value) ? value : throw new RunFolderException($"The manifest of '{full}' records no '{key}' argument; it cannot be resumed or merged.", full);
        RunFolderException Bad(string what) => new($"The manifest of '{full}' is not valid: {what}.", full);

        // An exact folder holds the master equation's laws, not replicates: there are no blocks to continue or to pool.
        if (manifest.ExtraText(ManifestFields.ErrorKind) == ManifestFields.ExactErrorKind)
            throw new RunFolderException($"'{full}' holds an exact solution of the master equation (written by 'copynumber exact'): it has no replicates, "
                + "so there is nothing to resume or merge. Run 'exact' again with the settings you want, or 'simulate' for a sampled ensemble.", full);

        if (!int.TryParse(Field(ManifestFields.BlockSize), NumberStyles.None, CultureInfo.InvariantCulture, out var blockSize) || blockSize < 1) throw Bad("block_size is not a positive whole number");
        if (!long.TryParse(Field(ManifestFields.TotalBlocks), NumberStyles.None, CultureInfo.InvariantCulture, out var totalBlocks) || totalBlocks < 1) throw Bad("total_blocks is not a positive whole number");
        if (!Shard.TryParse(Argument(ManifestFields.ShardArgument), out var shard, out var shardProblem)) throw Bad(shardProblem);
        long[] finished;
        try
        {
            finished = BlockRanges.Parse(Field(ManifestFields.FinishedBlocks)).Order().ToArray();
        }
        catch (Exception e) when (e is FormatException or OverflowException)
        {
            throw Bad($"finished_blocks is not a list of block ranges ({e.Message})");
        }
        if (finished.Length > 0 && (finished[0] < 0 || finished[^1] >= totalBlocks)) throw Bad("finished_blocks names a block outside the run");
        if (BlockRanges.BlocksFor(manifest.ReplicatesRequested, blockSize) != totalBlocks)
            throw Bad("replicates_requested, block_size and total_blocks do not agree");
        var expected = finished.Sum(b => BlockRanges.ReplicatesIn(manifest.ReplicatesRequested, blockSize, b, b + 1));
        if (expected != manifest.ReplicatesFinished) throw Bad($"replicates_finished is {manifest.ReplicatesFinished}, but the finished blocks hold {expected} replicates");
        TimeGrid grid;
        try
        {
            grid = new TimeGrid(double.Parse(Argument("until"), CultureInfo.InvariantCulture), double.Parse(Argument("every"), CultureInfo.InvariantCulture));
        }
        catch (Exception e) when (e is FormatException or ArgumentOutOfRangeException)
        {
            throw Bad($"its until and every arguments do not make a time grid ({e.Message})");
        }
        return new StoredRun(full, manifest, blockSize, totalBlocks, shard, finished, grid);
    }

    /// <summary>Checks that <paramref name="settings"/> (the command about to resume this run) are this run's own.</summary>
    /// <exception cref="RunFolderException">They differ; the message lists every difference.</exception>
    public void EnsureSameRun(RunSettings settings)
    {
        ArgumentNullException.ThrowIfNull(settings);
        var differences = settings.Differences(RunSettings.Of(this), "this command", "the stored run", includeShard: true);
        if (differences.Count > 0)
            throw new RunFolderException($"Cannot resume '{Folder}': this command's settings differ from those of the run stored there:\n  {string.Join("\n  ", differences)}", Folder);
    }

    /// <summary>The model text stored in the run's tables, checked against the manifest's SHA-256.</summary>
    /// <exception cref="RunFolderException">No table holds it, or it does not match.</exception>
    public string ModelText()
    {
        using var reader = ParquetTableReader.Open(Path.Combine(Folder, RunFiles.Moments));
        var text = reader.Require(Provenance.ModelTextKey);
        if (Provenance.Sha256Hex(text) != Manifest.ModelSha256)
            throw reader.Damaged("the model text it records does not have the SHA-256 the manifest records");
        return text;
    }

    /// <summary>
    /// The run's summaries over its finished blocks, for <paramref name="network"/> (the run's own model).
    /// Exact: the result combines with others as if it had just been run.
    /// </summary>
    /// <exception cref="RunFolderException">A table is missing, damaged, or covers other blocks than the manifest says.</exception>
    public EnsembleResult Load(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        var quantities = Quantity.Of(network);
        var counts = quantities.Where(q => q.IsCount).ToArray();
        var reals = quantities.Where(q => !q.IsCount).ToArray();
        var blocks = BlockRanges.Format(FinishedBlocks);

        CountHistogram[] histograms;
        using (var reader = ParquetTableReader.Open(Path.Combine(Folder, RunFiles.Distributions)))
        {
            CheckCovers(reader, blocks);
            histograms = DistributionsTable.ReadHistograms(reader, Grid, counts);
        }
        MomentTree tree;
        if (reals.Length == 0) tree = new MomentTree(TotalBlocks, 0);
        else
        {
            using var reader = ParquetTableReader.Open(Path.Combine(Folder, RunFiles.ReadoutState));
            CheckCovers(reader, blocks);
            tree = ReadoutStateTable.Read(reader, Grid, reals, TotalBlocks);
            var covered = tree.Nodes.SelectMany(n => Range(n.FirstBlock, n.EndBlock)).Order().ToArray();
            if (!covered.SequenceEqual(FinishedBlocks)) throw reader.Damaged("its nodes do not cover exactly the finished blocks");
        }
        var stoppedEarly = long.TryParse(Manifest.ExtraText(ManifestFields.StoppedEarly), NumberStyles.None, CultureInfo.InvariantCulture, out var s) ? s : 0;
        var finished = FinishedBlocks.ToArray();
        return new EnsembleResult(
            Grid, quantities, histograms, tree, Manifest.ReplicatesFinished, Manifest.EventsFired, stoppedEarly,
            finished, BlockSize, Manifest.ReplicatesRequested, Shard,
            !EnsembleResult.Covers(finished, Shard.Blocks(TotalBlocks)), TimeSpan.FromSeconds(Manifest.WallSeconds),
            SwitchingJson.Read(Manifest, network, Grid.Until));
    }

    private static IEnumerable<long> Range(long first, long end)
    {
        for (var b = first; b < end; b++) yield return b;
    }

    private void CheckCovers(ParquetTableReader reader, string blocks)
    {
        var recorded = reader.Require(Provenance.KeyPrefix + RunFiles.FinishedBlocksKey);
        if (recorded != blocks)
            throw new RunFolderException(
                $"'{reader.Path}' holds blocks {recorded} but the manifest of '{Folder}' says {blocks}: the folder was changed, or its writing was cut short. " +
                "Rerun it, or resume from a copy made before.", Folder);
    }
}
