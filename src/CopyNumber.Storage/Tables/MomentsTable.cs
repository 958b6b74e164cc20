using CopyNumber.Deterministic;
using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// <c>moments.parquet</c>: one row per (time, species or readout) with the ensemble statistics and the
/// rate-equation value at that time. Real-valued readouts have no quantiles or p_zero (NaN); a time no
/// replicate reached (an interrupted run with nothing finished, or every replicate stopped early) has
/// replicates 0 and NaN statistics.
/// </summary>
public static class MomentsTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "time", "species", "replicates", "mean", "variance", "std_error", "fano", "cv2", "min",
        "q05", "q25", "median", "q75", "q95", "max", "p_zero", "deterministic",
    ];

    /// <summary>Writes the table; one row group per block of grid points keeps memory flat for long grids.</summary>
    public static void Write(string path, EnsembleResult result, DeterministicSolution? deterministic, IReadOnlyDictionary<string, string> metadata) =>
        Write(path, Rows(result, deterministic), metadata);

    /// <summary>
    /// Writes rows given in file order (time, then quantity), a row group per block of about 65 536 rows
    /// ending between times. <see cref="MomentRow.Statistics"/> holds the columns from mean to p_zero in file order.
    /// </summary>
    public static void Write(string path, IEnumerable<MomentRow> rows, IReadOnlyDictionary<string, string> metadata)
    {
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species" => ColumnType.String,
            "replicates" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var time = new List<double>();
        var name = new List<string>();
        var replicates = new List<long>();
        var stats = Enumerable.Range(0, StatisticsCount + 1).Select(_ => new List<double>()).ToArray();
        void FlushGroup()
        {
            writer.WriteRowGroup([time.ToArray(), name.ToArray(), replicates.ToArray(), .. stats.Select(s => s.ToArray())]);
            time.Clear(); name.Clear(); replicates.Clear();
            foreach (var s in stats) s.Clear();
        }
        foreach (var row in rows)
        {
            if (time.Count >= 65_536 && time[^1] != row.Time) FlushGroup();
            time.Add(row.Time);
            name.Add(row.Quantity);
            replicates.Add(row.Replicates);
            for (var c = 0; c < StatisticsCount; c++) stats[c].Add(row.Statistics[c]);
            stats[StatisticsCount].Add(row.Deterministic);
        }
        if (time.Count > 0 || writer.RowsWritten == 0) FlushGroup();
        writer.Complete();
    }

    /// <summary>The statistics columns between replicates and deterministic (mean … p_zero).</summary>
    public const int StatisticsCount = 13;

    private static IEnumerable<MomentRow> Rows(EnsembleResult result, DeterministicSolution? deterministic)
    {
        var quantities = result.Quantities;
        var deterministicColumn = quantities.Select(q => deterministic is null ? -1 : IndexOf(deterministic.Columns, q.Name)).ToArray();
        for (var k = 0; k < result.Grid.Count; k++)
        {
            int countIndex = 0, realIndex = 0;
            for (var q = 0; q < quantities.Count; q++)
            {
                long replicates;
                double[] values;
                if (quantities[q].IsCount && result.Histogram(k, countIndex).IsEmpty)
                {
                    // No replicate recorded this time (none finished yet, or all stopped early).
                    countIndex++;
                    replicates = 0;
                    values = Enumerable.Repeat(double.NaN, StatisticsCount).ToArray();
                }
                else if (quantities[q].IsCount)
                {
                    var s = DistributionSummary.From(result.Histogram(k, countIndex++));
                    replicates = s.Replicates;
                    values = [s.Mean, s.Variance, s.StandardError, s.FanoFactor, s.SquaredCoefficientOfVariation, s.Minimum, s.Quantile05, s.Quantile25, s.Median, s.Quantile75, s.Quantile95, s.Maximum, s.ZeroFraction];
                }
                else
                {
                    var m = result.Moments(k, realIndex++);
                    replicates = m.Count;
                    var se = m.Count > 0 ? Math.Sqrt(m.Variance / m.Count) : double.NaN;
                    values = [m.Mean, m.Variance, se, NoiseRatios.Fano(m.Mean, m.Variance, m.Minimum), NoiseRatios.SquaredCoefficientOfVariation(m.Mean, m.Variance, m.Minimum), m.Minimum,
                        double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, m.Maximum, double.NaN];
                }
                yield return new MomentRow(result.Grid[k], quantities[q].Name, replicates, values,
                    deterministicColumn[q] >= 0 ? deterministic!.Values[k, deterministicColumn[q]] : double.NaN);
            }
        }
    }

    /// <summary>The column of <paramref name="name"/> in <paramref name="names"/>, or −1.</summary>
    internal static int ColumnOf(IReadOnlyList<string> names, string name) => IndexOf(names, name);

    private static int IndexOf(IReadOnlyList<string> names, string name)
    {
        for (var i = 0; i < names.Count; i++) if (names[i] == name) return i;
        return -1;
    }
}

/// <summary>One row of <c>moments.parquet</c>.</summary>
/// <param name="Time">Grid time.</param>
/// <param name="Quantity">Species or readout.</param>
/// <param name="Replicates">Replicates summarised (0 for an exact law, which has none).</param>
/// <param name="Statistics">mean, variance, std_error, fano, cv2, min, q05, q25, median, q75, q95, max, p_zero.</param>
/// <param name="Deterministic">The rate-equation value, or NaN.</param>
public readonly record struct MomentRow(double Time, string Quantity, long Replicates, double[] Statistics, double Deterministic);
