using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// The population snapshot of <c>simulate --view population</c> (<see cref="PopulationSnapshot"/>), in two
/// tables. <c>snapshot.parquet</c>, the laws: one row per (species, view, count) with <c>species</c>,
/// <c>view</c> ("lineage": the mother machine's time average; "population": a culture's snapshot),
/// <c>count</c>, <c>probability</c> and <c>probability_se</c>. <c>snapshot-moments.parquet</c>: one row per
/// (species, view) with <c>mean</c>, <c>variance</c>, <c>cv2</c> (variance over squared mean) and <c>fano</c>
/// (variance over mean), each with its <c>_se</c>, then <c>difference_mean</c> and <c>difference_variance</c>
/// (population − lineage, on the population's row; 0 on the lineage's) with their <c>_se</c>, <c>settling</c>
/// (the population mean over the later half of the sampled cycles minus that over the earlier half, near 0 when
/// the lineages had settled after the burn-in; NaN on the lineage's row and for one sampled cycle) with its
/// <c>_se</c>, and the
/// settings: <c>replicates</c>, <c>burn_in</c> (divisions), <c>cycles</c> (sampled per lineage),
/// <c>ages_per_cycle</c> and <c>growth_rate</c> (Λ, per model time unit).
/// </summary>
public static class SnapshotTable
{
    /// <summary>The laws' column names, in file order.</summary>
    public static readonly IReadOnlyList<string> LawColumns = ["species", "view", "count", "probability", "probability_se"];

    /// <summary>The moments' column names, in file order.</summary>
    public static readonly IReadOnlyList<string> MomentColumns =
    [
        "species", "view", "mean", "mean_se", "variance", "variance_se", "cv2", "cv2_se", "fano", "fano_se",
        "difference_mean", "difference_mean_se", "difference_variance", "difference_variance_se", "settling", "settling_se",
        "replicates", "burn_in", "cycles", "ages_per_cycle", "growth_rate",
    ];

    /// <summary>The name of a view in the tables.</summary>
    public static string ViewName(CellView view) => view == CellView.Lineage ? "lineage" : "population";

    /// <summary>Writes both tables.</summary>
    public static void Write(string lawsPath, string momentsPath, SnapshotResult result, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(result);
        var laws = result.Species.SelectMany(s => new[] { s.Lineage, s.Population }).ToArray();
        static ColumnType TypeOf(string n) => n switch
        {
            "species" or "view" => ColumnType.String,
            "count" or "replicates" or "burn_in" or "cycles" or "ages_per_cycle" => ColumnType.Int64,
            _ => ColumnType.Double,
        };
        using (var writer = ParquetTableWriter.Create(lawsPath, LawColumns.Select(n => new ColumnSpec(n, TypeOf(n))).ToArray(), metadata))
        {
            writer.WriteRowGroup([
                laws.SelectMany(l => l.Counts.Select(_ => l.Species)).ToArray(),
                laws.SelectMany(l => l.Counts.Select(_ => ViewName(l.View))).ToArray(),
                laws.SelectMany(l => l.Counts).ToArray(),
                laws.SelectMany(l => l.Probabilities).ToArray(),
                laws.SelectMany(l => l.ProbabilityErrors).ToArray(),
            ]);
            writer.Complete();
        }
        using (var writer = ParquetTableWriter.Create(momentsPath, MomentColumns.Select(n => new ColumnSpec(n, TypeOf(n))).ToArray(), metadata))
        {
            var difference = laws.Select((l, i) => l.View == CellView.Population
                ? (result.MeanDifference[i / 2], result.VarianceDifference[i / 2]) : (new Estimate(0, 0), new Estimate(0, 0))).ToArray();
            double[] Column(Func<int, double> value) => Enumerable.Range(0, laws.Length).Select(value).ToArray();
            long[] Setting(long value) => Enumerable.Repeat(value, laws.Length).ToArray();
            writer.WriteRowGroup([
                laws.Select(l => l.Species).ToArray(), laws.Select(l => ViewName(l.View)).ToArray(),
                Column(i => laws[i].Mean.Value), Column(i => laws[i].Mean.StandardError),
                Column(i => laws[i].Variance.Value), Column(i => laws[i].Variance.StandardError),
                Column(i => laws[i].Cv2.Value), Column(i => laws[i].Cv2.StandardError),
                Column(i => laws[i].Fano.Value), Column(i => laws[i].Fano.StandardError),
                Column(i => difference[i].Item1.Value), Column(i => difference[i].Item1.StandardError),
                Column(i => difference[i].Item2.Value), Column(i => difference[i].Item2.StandardError),
                Column(i => laws[i].View == CellView.Population ? result.Settling[i / 2].Value : double.NaN),
                Column(i => laws[i].View == CellView.Population ? result.Settling[i / 2].StandardError : double.NaN),
                Setting(result.Replicates), Setting(result.BurnIn), Setting(result.Cycles), Setting(result.AgesPerCycle),
                Column(_ => result.GrowthRate),
            ]);
            writer.Complete();
        }
    }

    /// <summary>Reads both tables of <paramref name="folder"/> back, or null when the run has no snapshot.</summary>
    /// <exception cref="RunFolderException">A table is damaged.</exception>
    public static StoredSnapshot? Read(string folder)
    {
        var lawsPath = Path.Combine(folder, RunFiles.Snapshot);
        var momentsPath = Path.Combine(folder, RunFiles.SnapshotMoments);
        if (!File.Exists(lawsPath) || !File.Exists(momentsPath)) return null;
        // Tables the manifest does not record were cut off before it recorded them (a kill between the two writes): not used.
        if (!RunFiles.RecordedAddOns(folder, RunFiles.Snapshot, RunFiles.SnapshotMoments)) return null;
        var rows = new List<StoredSnapshotMoments>();
        int burnIn, cycles, ages;
        long replicates;
        double growth;
        using (var table = ParquetTableReader.Open(momentsPath))
        {
            var species = table.Strings("species");
            var view = table.Strings("view");
            var values = MomentColumns.Skip(2).Take(14).Select(c => table.Doubles(c)).ToArray();
            for (var r = 0; r < species.Length; r++)
                rows.Add(new StoredSnapshotMoments(species[r], view[r], new(values[0][r], values[1][r]), new(values[2][r], values[3][r]),
                    new(values[4][r], values[5][r]), new(values[6][r], values[7][r]), new(values[8][r], values[9][r]), new(values[10][r], values[11][r]),
                    new(values[12][r], values[13][r])));
            if (species.Length == 0) throw table.Damaged($"{RunFiles.SnapshotMoments} has no rows");
            (replicates, burnIn, cycles, ages, growth) = (table.Longs("replicates")[0], (int)table.Longs("burn_in")[0], (int)table.Longs("cycles")[0],
                (int)table.Longs("ages_per_cycle")[0], table.Doubles("growth_rate")[0]);
        }
        var laws = new Dictionary<(string, string), (List<long> Counts, List<double> Probabilities)>();
        using (var table = ParquetTableReader.Open(lawsPath))
        {
            var (species, view, count, probability) = (table.Strings("species"), table.Strings("view"), table.Longs("count"), table.Doubles("probability"));
            for (var r = 0; r < species.Length; r++)
            {
                if (!laws.TryGetValue((species[r], view[r]), out var law)) laws[(species[r], view[r])] = law = ([], []);
                law.Counts.Add(count[r]);
                law.Probabilities.Add(probability[r]);
            }
        }
        return new StoredSnapshot(rows, laws.ToDictionary(p => p.Key, p => (p.Value.Counts.ToArray(), p.Value.Probabilities.ToArray())),
            replicates, burnIn, cycles, ages, growth);
    }
}

/// <summary>One row of <c>snapshot-moments.parquet</c>.</summary>
/// <param name="Species">The species.</param>
/// <param name="View">"lineage" or "population".</param>
/// <param name="Mean">Mean count.</param>
/// <param name="Variance">Variance.</param>
/// <param name="Cv2">Squared coefficient of variation.</param>
/// <param name="Fano">Fano factor.</param>
/// <param name="DifferenceMean">Population − lineage mean (0 on a lineage row).</param>
/// <param name="DifferenceVariance">Population − lineage variance (0 on a lineage row).</param>
/// <param name="Settling">Later minus earlier half of the sampled cycles, of the population mean (NaN on a lineage row).</param>
public sealed record StoredSnapshotMoments(string Species, string View, Estimate Mean, Estimate Variance, Estimate Cv2, Estimate Fano,
    Estimate DifferenceMean, Estimate DifferenceVariance, Estimate Settling);

/// <summary>A run's population snapshot as read back: the moments' rows, the laws by (species, view), and the settings.</summary>
/// <param name="Moments">The rows of <c>snapshot-moments.parquet</c>.</param>
/// <param name="Laws">Counts and probabilities by (species, view).</param>
/// <param name="Replicates">Independent replicates.</param>
/// <param name="BurnIn">Divisions before the first sampled cycle.</param>
/// <param name="Cycles">Cycles sampled per lineage.</param>
/// <param name="AgesPerCycle">Records per cycle.</param>
/// <param name="GrowthRate">The culture's growth rate Λ.</param>
public sealed record StoredSnapshot(
    IReadOnlyList<StoredSnapshotMoments> Moments,
    IReadOnlyDictionary<(string Species, string View), (long[] Counts, double[] Probabilities)> Laws,
    long Replicates, int BurnIn, int Cycles, int AgesPerCycle, double GrowthRate);
