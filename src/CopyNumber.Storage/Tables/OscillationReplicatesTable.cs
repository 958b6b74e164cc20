using CopyNumber.Analysis.Oscillation;

namespace CopyNumber.Storage;

/// <summary>
/// <c>oscillation-replicates.parquet</c>: one row per (species, replicate of the oscillation sample) with the replicate's
/// complete cycles, period (model time units) and amplitude (copies), NaN with fewer than two cycles
/// (docs/methods-analysis.md, section 7). Columns: <c>species</c>, <c>replicate</c>, <c>cycles</c>, <c>period</c>, <c>amplitude</c>.
/// </summary>
public static class OscillationReplicatesTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames = ["species", "replicate", "cycles", "period", "amplitude"];

    /// <summary>Writes the table of <paramref name="oscillation"/>'s species.</summary>
    public static void Write(string path, RunOscillation oscillation, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(oscillation);
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species" => ColumnType.String,
            "replicate" or "cycles" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        foreach (var s in oscillation.Species)
        {
            var n = s.Cycles.Count;
            writer.WriteRowGroup([
                Enumerable.Repeat(s.Species, n).ToArray(),
                Enumerable.Range(0, n).Select(r => (long)r).ToArray(),
                s.Cycles.Select(c => (long)c.Count).ToArray(),
                s.Cycles.Select(c => c.Period).ToArray(),
                s.Cycles.Select(c => c.Amplitude).ToArray(),
            ]);
        }
        writer.Complete();
    }
}
