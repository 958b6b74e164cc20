using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// <c>distributions.parquet</c>: the exact ensemble histograms, one row per (time, species or count
/// readout, count) observed at least once, in that order. <c>frequency</c> is the exact number of
/// replicates with that count (int64); <c>probability</c> = frequency / replicates recorded at that time.
/// The frequencies make the file a complete record of the histograms, which is what lets an
/// interrupted run be resumed and shards be merged exactly.
/// </summary>
public static class DistributionsTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames = ["time", "species", "count", "probability", "frequency"];

    /// <summary>Writes the histograms, a row group per batch of roughly a million rows.</summary>
    public static void Write(string path, EnsembleResult result, IReadOnlyDictionary<string, string> metadata) =>
        Write(path, Rows(result), metadata);

    /// <summary>
    /// Writes rows given in file order (time, then quantity, then increasing count), a row group per batch of
    /// roughly a million rows. An exact law (from the master equation) has no replicates: its frequency is 0.
    /// </summary>
    public static void Write(string path, IEnumerable<DistributionRow> rows, IReadOnlyDictionary<string, string> metadata)
    {
        ColumnSpec[] columns =
        [
            new("time", ColumnType.Double), new("species", ColumnType.String),
            new("count", ColumnType.Int64), new("probability", ColumnType.Double), new("frequency", ColumnType.Int64),
        ];
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var time = new List<double>();
        var name = new List<string>();
        var count = new List<long>();
        var probability = new List<double>();
        var frequencies = new List<long>();
        void FlushGroup()
        {
            if (time.Count == 0) return;
            writer.WriteRowGroup([time.ToArray(), name.ToArray(), count.ToArray(), probability.ToArray(), frequencies.ToArray()]);
            time.Clear(); name.Clear(); count.Clear(); probability.Clear(); frequencies.Clear();
        }
        foreach (var row in rows)
        {
            // Row groups end between times only, as before.
            if (time.Count >= 1_000_000 && time[^1] != row.Time) FlushGroup();
            time.Add(row.Time);
            name.Add(row.Quantity);
            count.Add(row.Count);
            probability.Add(row.Probability);
            frequencies.Add(row.Frequency);
        }
        FlushGroup();
        if (writer.RowsWritten == 0) writer.WriteRowGroup([Array.Empty<double>(), Array.Empty<string>(), Array.Empty<long>(), Array.Empty<double>(), Array.Empty<long>()]);
        writer.Complete();
    }

    private static IEnumerable<DistributionRow> Rows(EnsembleResult result)
    {
        for (var k = 0; k < result.Grid.Count; k++)
        {
            for (var q = 0; q < result.CountQuantities.Count; q++)
            {
                var histogram = result.Histogram(k, q);
                var total = (double)histogram.Total;
                foreach (var (value, frequency) in histogram)
                    yield return new DistributionRow(result.Grid[k], result.CountQuantities[q].Name, value, frequency / total, frequency);
            }
        }
    }

    /// <summary>
    /// The histograms stored in <paramref name="reader"/>'s file, indexed grid point major like
    /// <see cref="EnsembleResult.Histogram"/>: [k · countQuantities.Count + q].
    /// </summary>
    /// <exception cref="RunFolderException">The file lacks a column, or names a time or quantity the run does not have.</exception>
    internal static CountHistogram[] ReadHistograms(ParquetTableReader reader, TimeGrid grid, IReadOnlyList<Quantity> countQuantities)
    {
        var histograms = new CountHistogram[grid.Count * countQuantities.Count];
        for (var h = 0; h < histograms.Length; h++) histograms[h] = new CountHistogram();
        var points = StoredCells.GridIndex(grid);
        var names = StoredCells.NameIndex(countQuantities);
        for (var g = 0; g < reader.RowGroups; g++)
        {
            var time = reader.Doubles("time", g);
            var species = reader.Strings("species", g);
            var count = reader.Longs("count", g);
            var frequency = reader.Longs("frequency", g);
            for (var row = 0; row < time.Length; row++)
            {
                var k = StoredCells.Find(points, time[row], reader, "time");
                var q = StoredCells.Find(names, species[row], reader, "species");
                if (frequency[row] < 1) throw reader.Damaged($"row {row} of row group {g} has frequency {frequency[row]}");
                histograms[k * countQuantities.Count + q].Add(count[row], frequency[row]);
            }
        }
        return histograms;
    }
}

/// <summary>One row of <c>distributions.parquet</c>.</summary>
/// <param name="Time">Grid time.</param>
/// <param name="Quantity">Species or count readout.</param>
/// <param name="Count">The copy number.</param>
/// <param name="Probability">Its probability at that time.</param>
/// <param name="Frequency">Replicates with that count (0 for an exact law).</param>
public readonly record struct DistributionRow(double Time, string Quantity, long Count, double Probability, long Frequency);
