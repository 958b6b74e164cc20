using System.Globalization;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// A run folder read back: its manifest, and on request its summaries as an <see cref="EnsembleResult"/>
/// (histograms from the frequencies of <c>distributions.parquet</c>, real moments from
/// <c>readout-state.parquet</c>), so that it can be resumed or merged exactly. Every file records the
/// finished blocks it covers; they must agree with the manifest, which is written last, so a folder
/// whose writing was cut short is refused rather than counted twice. Every table is checked against the
/// SHA-256 its manifest records (<see cref="FileChecksums"/>). A run killed before or during its final
/// write is read from its newest complete checkpoint (<see cref="OpenForResume"/>).
/// </summary>
public sealed class StoredRun
{
    private readonly string _tables;

    private StoredRun(string folder, string tables, RunManifest manifest, int blockSize, long totalBlocks, Shard shard, long[] finishedBlocks, TimeGrid grid)
    {
        Folder = folder;
        _tables = tables;
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

    /// <summary>True when the state was read from a checkpoint: the run was stopped before its final write was complete.</summary>
    public bool FromCheckpoint { get; private init; }

    /// <summary>True when resuming has something to do: blocks to run, or the final tables to write from a checkpoint.</summary>
    public bool NeedsResuming => IsPartial || FromCheckpoint;

    /// <summary>The parts of paths.parquet the checkpoint holds (file name in <see cref="Folder"/> → SHA-256, verified); empty when not read from a checkpoint.</summary>
    public IReadOnlyDictionary<string, string> PathParts { get; private init; } = new Dictionary<string, string>();

    /// <summary>Things the reader should know but that do not stop the reading (e.g. a folder written without checksums).</summary>
    public IReadOnlyList<string> Warnings { get; private init; } = [];

    /// <summary>
    /// Reads <paramref name="folder"/>/manifest.json, checks it describes a resumable run and verifies the
    /// checksums of its tables (a folder written before checksums existed is read with a warning).
    /// </summary>
    /// <exception cref="RunFolderException">The folder or its manifest is missing, the manifest lacks a field, or a table was changed or damaged after it was written.</exception>
    public static StoredRun Open(string folder)
    {
        ArgumentNullException.ThrowIfNull(folder);
        var full = AtomicFile.FullPath(folder);
        if (!Directory.Exists(full)) throw new RunFolderException($"The run folder '{full}' does not exist.", full);
        return OpenTables(full, resuming: false);
    }

    private static StoredRun OpenTables(string full, bool resuming)
    {
        var warnings = new List<string>();
        if (!resuming && Checkpoints.Complete(full).Count > 0)
            warnings.Add($"'{full}' holds a checkpoint newer than its tables: its run was stopped during a resumption. Only the tables are read here; 'copynumber simulate --resume {full}' finishes the run.");
        if (!resuming && !File.Exists(Path.Combine(full, RunFiles.Manifest)) && Checkpoints.Complete(full).Count > 0)
            throw new RunFolderException($"'{full}' holds no {RunFiles.Manifest} yet: its run was stopped before it wrote its tables, but a checkpoint keeps its finished blocks. Finish it with 'copynumber simulate --resume {full}' first.", full);
        var run = Read(full, full);
        FileChecksums.VerifyRunFolder(run.Manifest, full, warnings);
        return new StoredRun(full, full, run.Manifest, run.BlockSize, run.TotalBlocks, run.Shard, [.. run.FinishedBlocks], run.Grid) { Warnings = warnings };
    }

    /// <summary>
    /// Opens <paramref name="folder"/> to resume it: from its newest complete checkpoint that verifies
    /// (a run killed while running or during its final write), else from its tables as <see cref="Open"/>
    /// does. Temporary files a killed writer left behind (<c>*.partial-*</c>, unfinished checkpoints,
    /// path parts no checkpoint refers to) are removed.
    /// </summary>
    /// <exception cref="RunFolderException">As <see cref="Open"/>.</exception>
    public static StoredRun OpenForResume(string folder)
    {
        ArgumentNullException.ThrowIfNull(folder);
        var full = AtomicFile.FullPath(folder);
        if (!Directory.Exists(full)) throw new RunFolderException($"The run folder '{full}' does not exist.", full);
        var warnings = new List<string>();
        foreach (var (_, checkpoint) in Checkpoints.Complete(full))
        {
            StoredRun run;
            IReadOnlyDictionary<string, string> parts;
            try
            {
                run = Read(full, checkpoint);
                var manifestPath = Path.Combine(checkpoint, RunFiles.Manifest);
                var files = FileChecksums.Recorded(run.Manifest, ManifestFields.Files, full)
                    ?? throw new RunFolderException($"'{manifestPath}' lists no checksums.", full);
                FileChecksums.Verify(files, checkpoint, manifestPath, RunFiles.Distributions, RunFiles.ReadoutState);
                parts = FileChecksums.Recorded(run.Manifest, ManifestFields.PathParts, full) ?? new Dictionary<string, string>();
                FileChecksums.Verify(parts, full, manifestPath);
            }
            catch (RunFolderException e)
            {
                warnings.Add($"the checkpoint '{checkpoint}' cannot be used ({e.Message}); an earlier state is used and its blocks are run again.");
                continue;
            }
            Checkpoints.DiscardStale(full, parts.Keys.ToHashSet(StringComparer.Ordinal));
            return new StoredRun(full, checkpoint, run.Manifest, run.BlockSize, run.TotalBlocks, run.Shard, [.. run.FinishedBlocks], run.Grid)
            {
                FromCheckpoint = true,
                PathParts = parts,
                Warnings = warnings,
            };
        }
        Checkpoints.DiscardStale(full, new HashSet<string>());
        var stored = OpenTables(full, resuming: true);
        return new StoredRun(full, full, stored.Manifest, stored.BlockSize, stored.TotalBlocks, stored.Shard, [.. stored.FinishedBlocks], stored.Grid)
        {
            Warnings = [.. warnings, .. stored.Warnings],
        };
    }

    /// <summary>Reads the manifest in <paramref name="tables"/> (the run folder or one of its checkpoints) of the run folder <paramref name="full"/>.</summary>
    private static StoredRun Read(string full, string tables)
    {
        var manifestPath = Path.Combine(tables, RunFiles.Manifest);
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
        if (!long.TryParse(Argument("replicates"), NumberStyles.None, CultureInfo.InvariantCulture, out var replicates) || replicates != manifest.ReplicatesRequested)
            throw Bad($"replicates_requested ({manifest.ReplicatesRequested}) does not agree with the replicates argument ('{Argument("replicates")}')");
        if (BlockRanges.BlocksFor(manifest.ReplicatesRequested, blockSize) != totalBlocks)
            throw Bad("replicates_requested, block_size and total_blocks do not agree");
        long[] finished;
        try
        {
            finished = BlockRanges.Parse(Field(ManifestFields.FinishedBlocks), totalBlocks).Order().ToArray();
        }
        catch (Exception e) when (e is FormatException or OverflowException)
        {
            throw Bad($"finished_blocks is not a list of block ranges ({e.Message})");
        }
        if (finished.Length > 0 && (finished[0] < 0 || finished[^1] >= totalBlocks)) throw Bad("finished_blocks names a block outside the run");
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
        return new StoredRun(full, tables, manifest, blockSize, totalBlocks, shard, finished, grid);
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
        using var reader = ParquetTableReader.Open(Path.Combine(_tables, RunFiles.Distributions));
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
        using (var reader = ParquetTableReader.Open(Path.Combine(_tables, RunFiles.Distributions)))
        {
            CheckCovers(reader, blocks);
            histograms = DistributionsTable.ReadHistograms(reader, Grid, counts);
        }
        var pairs = CovariancePairs(network);
        var replicatesPerDraw = ReplicatesPerDraw(network);
        var cellNames = EnsembleResult.CellNames(quantities, pairs, replicatesPerDraw);
        MomentTree tree;
        if (cellNames.Count == 0) tree = new MomentTree(TotalBlocks, 0);
        else
        {
            using var reader = ParquetTableReader.Open(Path.Combine(_tables, RunFiles.ReadoutState));
            CheckCovers(reader, blocks);
            tree = ReadoutStateTable.Read(reader, Grid, cellNames, TotalBlocks);
            var covered = tree.Nodes.SelectMany(n => Range(n.FirstBlock, n.EndBlock)).Order().ToArray();
            if (!covered.SequenceEqual(FinishedBlocks)) throw reader.Damaged("its nodes do not cover exactly the finished blocks");
        }
        var stoppedEarly = long.TryParse(Manifest.ExtraText(ManifestFields.StoppedEarly), NumberStyles.None, CultureInfo.InvariantCulture, out var s) ? s : 0;
        var finished = FinishedBlocks.ToArray();
        return new EnsembleResult(
            Grid, quantities, histograms, tree, Manifest.ReplicatesFinished, Manifest.EventsFired, stoppedEarly,
            finished, BlockSize, Manifest.ReplicatesRequested, Shard,
            !EnsembleResult.Covers(finished, Shard.Blocks(TotalBlocks)), TimeSpan.FromSeconds(Manifest.WallSeconds),
            SwitchingJson.Read(Manifest, network, Grid.Until), pairs, replicatesPerDraw)
        {
            ModeSwitching = ModeSwitchingJson.Read(Manifest, SwitchingCores(network), Grid.Until),
        };
    }

    /// <summary>
    /// g of the run's nested design (<see cref="ManifestFields.ReplicatesPerDrawArgument"/>) when <paramref name="network"/> varies a
    /// parameter and the manifest records it; 0 otherwise (no decomposition is stored).
    /// </summary>
    /// <exception cref="RunFolderException">The recorded value does not read or does not suit the run's blocks.</exception>
    public int ReplicatesPerDraw(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (!network.Variability.Any || !Manifest.Arguments.TryGetValue(ManifestFields.ReplicatesPerDrawArgument, out var text)) return 0;
        if (int.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var g) && EnsembleOptions.FitsBlock(g, BlockSize)) return g;
        throw new RunFolderException($"'{Folder}/manifest.json' records {ManifestFields.ReplicatesPerDrawArgument} '{text}', which is not a group size for blocks of {BlockSize}; it was edited or damaged.", Folder);
    }

    /// <summary>
    /// The cores whose modes the run followed: those its manifest records under <see cref="ManifestFields.SwitchingArgument"/>,
    /// none when it records none.
    /// </summary>
    /// <exception cref="RunFolderException">The recorded cores do not read against the run's model.</exception>
    public IReadOnlyList<ModeCore> SwitchingCores(ReactionNetwork network) => ModeSwitchingJson.Cores(Manifest, network, Folder);

    /// <summary>
    /// The species pairs the run accumulated: those its manifest records under <see cref="ManifestFields.CovariancePairsArgument"/>,
    /// or the default (<see cref="SpeciesPair.Default"/>) when it records none.
    /// </summary>
    /// <exception cref="RunFolderException">The recorded pairs do not read against the run's model.</exception>
    public IReadOnlyList<SpeciesPair> CovariancePairs(ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(network);
        if (!Manifest.Arguments.TryGetValue(ManifestFields.CovariancePairsArgument, out var text)) return SpeciesPair.Default(network);
        try
        {
            return SpeciesPair.Parse(text, network);
        }
        catch (ArgumentException e)
        {
            throw new RunFolderException($"'{Folder}/manifest.json' records the covariance pairs '{text}', which do not read: {e.Message}", Folder);
        }
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
