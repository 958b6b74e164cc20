namespace CopyNumber.Storage;

/// <summary>The per-time statistics of one species or readout, read from <c>moments.parquet</c>; arrays run over the grid.</summary>
/// <param name="Name">Species or readout name.</param>
/// <param name="Replicates">Replicates recorded at each time.</param>
/// <param name="Mean">Ensemble mean.</param>
/// <param name="Variance">Unbiased ensemble variance.</param>
/// <param name="StandardError">Standard error of the mean.</param>
/// <param name="Quantile05">5% quantile (NaN for real-valued readouts).</param>
/// <param name="Quantile95">95% quantile (NaN for real-valued readouts).</param>
/// <param name="ZeroFraction">P(count = 0) (NaN for real-valued readouts).</param>
/// <param name="Deterministic">Rate-equation value (NaN when it could not be computed).</param>
public sealed record QuantitySeries(
    string Name,
    long[] Replicates,
    double[] Mean,
    double[] Variance,
    double[] StandardError,
    double[] Quantile05,
    double[] Quantile95,
    double[] ZeroFraction,
    double[] Deterministic);

/// <summary>
/// A finished <c>simulate</c> folder read back: the manifest, the model text it ran (from the tables'
/// provenance), the moments per quantity, the exact distributions and, when written, sample paths.
/// </summary>
public sealed class RunFolder
{
    private readonly Dictionary<(string Quantity, int TimeIndex), (long[] Counts, double[] Probabilities)> _distributions;
    private readonly PathColumns? _paths;

    /// <summary>The columns of paths.parquet, read once.</summary>
    private sealed record PathColumns(long[] Replicate, double[] Time, IReadOnlyDictionary<string, long[]> Species);

    private RunFolder(string path, RunManifest manifest, string modelText, double[] times, IReadOnlyList<QuantitySeries> quantities,
        Dictionary<(string, int), (long[], double[])> distributions, PathColumns? paths)
    {
        Path = path;
        Manifest = manifest;
        ModelText = modelText;
        Times = times;
        Quantities = quantities;
        _distributions = distributions;
        _paths = paths;
    }

    /// <summary>The folder.</summary>
    public string Path { get; }

    /// <summary>manifest.json.</summary>
    public RunManifest Manifest { get; }

    /// <summary>The exact model text that was simulated.</summary>
    public string ModelText { get; }

    /// <summary>Grid times.</summary>
    public double[] Times { get; }

    /// <summary>Species then readouts, in the order of the tables.</summary>
    public IReadOnlyList<QuantitySeries> Quantities { get; }

    /// <summary>What the reader should know (e.g. that the folder was written without checksums).</summary>
    public IReadOnlyList<string> Warnings { get; private init; } = [];

    /// <summary>For one shard of a run: a sentence saying which part of the run it holds (also among <see cref="Warnings"/>); null for a whole run.</summary>
    public string? PartOfRun { get; private init; }

    /// <summary>
    /// The intrinsic/extrinsic split of each quantity's variance (<c>noise.parquet</c>), when parameters vary
    /// per cell; empty otherwise.
    /// </summary>
    public IReadOnlyList<StoredNoiseSplit> Noise { get; private init; } = [];

    /// <summary>The variance binomial partitioning adds, per count quantity (<c>partition.parquet</c>), when the run had its control; empty otherwise.</summary>
    public IReadOnlyList<StoredPartitionSplit> Partition { get; private init; } = [];

    /// <summary>The covariances of species pairs (<c>covariances.parquet</c>), when the run accumulated any; empty otherwise.</summary>
    public IReadOnlyList<StoredCovariance> Covariances { get; private init; } = [];

    /// <summary>True when paths.parquet exists.</summary>
    public bool HasPaths => _paths is not null;

    /// <summary>The exact distribution of a count quantity at grid point <paramref name="timeIndex"/>; empty when it has none.</summary>
    public (long[] Counts, double[] Probabilities) Distribution(string quantity, int timeIndex) =>
        _distributions.TryGetValue((quantity, timeIndex), out var d) ? d : ([], []);

    /// <summary>Up to <paramref name="count"/> sample paths of a species, each aligned with <see cref="Times"/> (NaN where not recorded).</summary>
    public IReadOnlyList<double[]> SamplePaths(string species, int count)
    {
        if (_paths is null || !_paths.Species.TryGetValue(species, out var values)) return [];
        var replicate = _paths.Replicate;
        var time = _paths.Time;
        var index = Times.Select((t, k) => (t, k)).ToDictionary(p => p.t, p => p.k);
        var result = new List<double[]>();
        var current = -1L;
        double[]? path = null;
        for (var row = 0; row < replicate.Length; row++)
        {
            if (replicate[row] != current)
            {
                if (result.Count == count) break;
                current = replicate[row];
                path = Enumerable.Repeat(double.NaN, Times.Length).ToArray();
                result.Add(path);
            }
            if (index.TryGetValue(time[row], out var k)) path![k] = values[row];
        }
        return result;
    }

    /// <summary>Reads a run folder.</summary>
    /// <exception cref="OutputException">A file is missing or unreadable.</exception>
    /// <exception cref="RunFolderException">A table is damaged, or was changed after it was written (its SHA-256 differs from the manifest's).</exception>
    public static RunFolder Read(string folder)
    {
        if (!Directory.Exists(folder)) throw new RunFolderException($"'{folder}' is not a folder", folder);
        var manifest = RunManifest.Read(System.IO.Path.Combine(folder, RunFiles.Manifest));
        var warnings = new List<string>();
        FileChecksums.VerifyRunFolder(manifest, AtomicFile.FullPath(folder), warnings);
        string? partOfRun = null;
        if (manifest.Arguments.TryGetValue(ManifestFields.ShardArgument, out var shardText) && CopyNumber.Ensembles.Shard.TryParse(shardText, out var shard, out _) && !shard.IsWhole)
        {
            partOfRun = $"This folder holds shard {shard} of a run: {manifest.ReplicatesFinished} of the run's {manifest.ReplicatesRequested} replicates, "
                + "so its contrast describes that part only; combine the shards with 'copynumber merge' and contrast the merged folder for the whole run.";
            warnings.Add(partOfRun);
        }
        using var moments = ParquetTableReader.Open(System.IO.Path.Combine(folder, RunFiles.Moments));
        if (!moments.Metadata.TryGetValue(Provenance.ModelTextKey, out var modelText))
            throw new RunFolderException($"'{folder}/{RunFiles.Moments}' carries no model text in its metadata, so it was not written by copynumber's simulate or exact", folder);
        var tables = new TableAgreement(folder, manifest);
        tables.Note(RunFiles.Moments, moments.Metadata);

        var time = moments.Doubles("time");
        var name = moments.Strings("species");
        var times = time.Distinct().ToArray();
        var timeIndex = times.Select((t, k) => (t, k)).ToDictionary(p => p.t, p => p.k);
        var names = name.Distinct().ToArray();
        var columns = new[] { "mean", "variance", "std_error", "q05", "q95", "p_zero", "deterministic" }
            .Select(c => moments.Doubles(c)).ToArray();
        var replicates = moments.Longs("replicates");
        var series = names.Select(n => new
        {
            Name = n,
            Replicates = new long[times.Length],
            Values = Enumerable.Range(0, columns.Length).Select(_ => Enumerable.Repeat(double.NaN, times.Length).ToArray()).ToArray(),
        }).ToDictionary(s => s.Name);
        for (var row = 0; row < time.Length; row++)
        {
            var s = series[name[row]];
            var k = timeIndex[time[row]];
            if (!double.IsNaN(s.Values[0][k]) || s.Replicates[k] != 0)
                throw tables.Mismatch($"{RunFiles.Moments} holds '{name[row]}' at time {time[row].ToString("R", System.Globalization.CultureInfo.InvariantCulture)} twice");
            s.Replicates[k] = replicates[row];
            for (var c = 0; c < columns.Length; c++) s.Values[c][k] = columns[c][row];
        }
        var quantities = names.Select(n => series[n])
            .Select(s => new QuantitySeries(s.Name, s.Replicates, s.Values[0], s.Values[1], s.Values[2], s.Values[3], s.Values[4], s.Values[5], s.Values[6]))
            .ToArray();

        var distributions = new Dictionary<(string, int), (long[], double[])>();
        double[] dTime, dProbability;
        string[] dName;
        long[] dCount;
        using (var table = ParquetTableReader.Open(System.IO.Path.Combine(folder, RunFiles.Distributions)))
        {
            tables.Note(RunFiles.Distributions, table.Metadata);
            dTime = table.Doubles("time");
            dName = table.Strings("species");
            dCount = table.Longs("count");
            dProbability = table.Doubles("probability");
        }
        for (var start = 0; start < dTime.Length;)
        {
            var end = start;
            while (end < dTime.Length && dTime[end] == dTime[start] && dName[end] == dName[start]) end++;
            if (!timeIndex.TryGetValue(dTime[start], out var k))
                throw tables.Mismatch($"{RunFiles.Distributions} has time {dTime[start].ToString("R", System.Globalization.CultureInfo.InvariantCulture)}, which {RunFiles.Moments} does not have");
            if (!series.ContainsKey(dName[start]))
                throw tables.Mismatch($"{RunFiles.Distributions} has the quantity '{dName[start]}', which {RunFiles.Moments} does not have");
            if (!distributions.TryAdd((dName[start], k), (dCount[start..end], dProbability[start..end])))
                throw tables.Mismatch($"{RunFiles.Distributions} holds '{dName[start]}' at time {dTime[start].ToString("R", System.Globalization.CultureInfo.InvariantCulture)} in two places");
            start = end;
        }

        var pathsFile = System.IO.Path.Combine(folder, RunFiles.Paths);
        PathColumns? paths = null;
        if (File.Exists(pathsFile))
        {
            using var table = ParquetTableReader.Open(pathsFile);
            tables.Note(RunFiles.Paths, table.Metadata, summarises: false);
            var speciesColumns = table.ColumnNames.Where(c => c is not ("replicate" or "time")).ToDictionary(c => c, c => table.Longs(c));
            paths = new PathColumns(table.Longs("replicate"), table.Doubles("time"), speciesColumns);
        }
        var noise = ReadOptional(folder, RunFiles.Noise, tables, table => NoiseTable.Read(table, times));
        var covariances = ReadOptional(folder, RunFiles.Covariances, tables, table => CovariancesTable.Read(table, times));
        var partition = ReadOptional(folder, RunFiles.Partition, tables, table => PartitionTable.Read(table, times));
        return new RunFolder(folder, manifest, modelText, times, quantities, distributions, paths)
            { Warnings = warnings, PartOfRun = partOfRun, Noise = noise, Covariances = covariances, Partition = partition };
    }

    /// <summary>A table the run writes only in some cases (a decomposition, covariances): read when present, checked against the manifest like the others; empty when absent.</summary>
    private static IReadOnlyList<T> ReadOptional<T>(string folder, string file, TableAgreement tables, Func<ParquetTableReader, IReadOnlyList<T>> read)
    {
        var path = System.IO.Path.Combine(folder, file);
        if (!File.Exists(path)) return [];
        using var table = ParquetTableReader.Open(path);
        tables.Note(file, table.Metadata);
        return read(table);
    }
}
