using CopyNumber.Ensembles;

namespace CopyNumber.Output;

/// <summary>
/// <c>distributions.parquet</c>: the exact ensemble histograms, one row per (time, species or count
/// readout, count) with nonzero probability; probability = frequency / replicates recorded at that time.
/// </summary>
public static class DistributionsTable
{
    /// <summary>Writes the histograms, a row group per batch of roughly a million rows.</summary>
    public static void Write(string path, EnsembleResult result, IReadOnlyDictionary<string, string> metadata)
    {
        ColumnSpec[] columns =
        [
            new("time", ColumnType.Double), new("species", ColumnType.String),
            new("count", ColumnType.Int64), new("probability", ColumnType.Double),
        ];
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var time = new List<double>();
        var name = new List<string>();
        var count = new List<long>();
        var probability = new List<double>();
        void FlushGroup()
        {
            if (time.Count == 0) return;
            writer.WriteRowGroup([time.ToArray(), name.ToArray(), count.ToArray(), probability.ToArray()]);
            time.Clear(); name.Clear(); count.Clear(); probability.Clear();
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
                }
            }
            if (time.Count >= 1_000_000) FlushGroup();
        }
        FlushGroup();
        if (writer.RowsWritten == 0) writer.WriteRowGroup([Array.Empty<double>(), Array.Empty<string>(), Array.Empty<long>(), Array.Empty<double>()]);
        writer.Complete();
    }
}
