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
    public static void Write(string path, EnsembleResult result, IReadOnlyDictionary<string, string> metadata)
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
        for (var k = 0; k < result.Grid.Count; k++)
        {
            for (var q = 0; q < result.CountQuantities.Count; q++)
            {
                var histogram = result.Histogram(k, q);
                var total = (double)histogram.Total;
                foreach (var (value, frequency) in histogram)
                {
                    time.Add(result.Grid[k]);
                    name.Add(result.CountQuantities[q].Name);
                    count.Add(value);
                    probability.Add(frequency / total);
                    frequencies.Add(frequency);
                }
            }
            if (time.Count >= 1_000_000) FlushGroup();
        }
        FlushGroup();
        if (writer.RowsWritten == 0) writer.WriteRowGroup([Array.Empty<double>(), Array.Empty<string>(), Array.Empty<long>(), Array.Empty<double>(), Array.Empty<long>()]);
        writer.Complete();
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
