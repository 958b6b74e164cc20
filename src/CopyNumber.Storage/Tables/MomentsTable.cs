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
    public static void Write(string path, EnsembleResult result, DeterministicSolution? deterministic, IReadOnlyDictionary<string, string> metadata)
    {
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species" => ColumnType.String,
            "replicates" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var quantities = result.Quantities;
        var deterministicColumn = quantities.Select(q => deterministic is null ? -1 : IndexOf(deterministic.Columns, q.Name)).ToArray();
        const int pointsPerGroup = 4096;
        for (var start = 0; start < result.Grid.Count; start += pointsPerGroup)
        {
            var end = Math.Min(result.Grid.Count, start + pointsPerGroup);
            var rows = (end - start) * quantities.Count;
            var time = new double[rows];
            var name = new string[rows];
            var replicates = new long[rows];
            var stats = Enumerable.Range(0, 14).Select(_ => new double[rows]).ToArray();
            var row = 0;
            for (var k = start; k < end; k++)
            {
                int countIndex = 0, realIndex = 0;
                for (var q = 0; q < quantities.Count; q++, row++)
                {
                    time[row] = result.Grid[k];
                    name[row] = quantities[q].Name;
                    double[] values;
                    if (quantities[q].IsCount && result.Histogram(k, countIndex).IsEmpty)
                    {
                        // No replicate recorded this time (none finished yet, or all stopped early).
                        countIndex++;
                        replicates[row] = 0;
                        values = Enumerable.Repeat(double.NaN, 13).ToArray();
                    }
                    else if (quantities[q].IsCount)
                    {
                        var s = DistributionSummary.From(result.Histogram(k, countIndex++));
                        replicates[row] = s.Replicates;
                        values = [s.Mean, s.Variance, s.StandardError, s.FanoFactor, s.SquaredCoefficientOfVariation, s.Minimum, s.Quantile05, s.Quantile25, s.Median, s.Quantile75, s.Quantile95, s.Maximum, s.ZeroFraction];
                    }
                    else
                    {
                        var m = result.Moments(k, realIndex++);
                        replicates[row] = m.Count;
                        var se = m.Count > 0 ? Math.Sqrt(m.Variance / m.Count) : double.NaN;
                        values = [m.Mean, m.Variance, se, NoiseRatios.Fano(m.Mean, m.Variance, m.Minimum), NoiseRatios.SquaredCoefficientOfVariation(m.Mean, m.Variance, m.Minimum), m.Minimum,
                            double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, m.Maximum, double.NaN];
                    }
                    for (var c = 0; c < values.Length; c++) stats[c][row] = values[c];
                    stats[13][row] = deterministicColumn[q] >= 0 ? deterministic!.Values[k, deterministicColumn[q]] : double.NaN;
                }
            }
            writer.WriteRowGroup([time, name, replicates, .. stats]);
        }
        writer.Complete();
    }

    private static int IndexOf(IReadOnlyList<string> names, string name)
    {
        for (var i = 0; i < names.Count; i++) if (names[i] == name) return i;
        return -1;
    }
}
