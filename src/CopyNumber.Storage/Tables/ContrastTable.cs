using CopyNumber.Analysis;

namespace CopyNumber.Storage;

/// <summary>
/// <c>contrast.parquet</c>: one row per (time, species or readout) with the deviation of the ensemble mean
/// from the rate equations and its confidence half-width, whether the sampling error resolves it, the
/// LNA variance ratio, noise measures and the mode count.
/// </summary>
public static class ContrastTable
{
    /// <summary>Column names in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "time", "species", "deviation", "deviation_half_width", "relative_deviation", "relative_half_width",
        "resolved", "deviation_from_corrected_mean", "variance_ratio", "cv", "fano", "modes",
    ];

    /// <summary>Writes the table atomically.</summary>
    public static void Write(string path, IReadOnlyList<QuantityContrast> quantities, IReadOnlyDictionary<string, string> metadata)
    {
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species" => ColumnType.String,
            "resolved" or "modes" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        var rows = quantities.Sum(q => q.Times.Count);
        var time = new double[rows];
        var name = new string[rows];
        var resolved = new long[rows];
        var modes = new long[rows];
        var values = Enumerable.Range(0, 8).Select(_ => new double[rows]).ToArray();
        var row = 0;
        // Time-major order like moments.parquet, so the two tables line up row by row for the same quantities.
        var longest = quantities.Count == 0 ? 0 : quantities.Max(q => q.Times.Count);
        for (var k = 0; k < longest; k++)
        {
            foreach (var q in quantities)
            {
                if (k >= q.Times.Count) continue;
                var d = q.Deviations[k];
                time[row] = q.Times[k];
                name[row] = q.Name;
                double[] cells = [d.Absolute, d.AbsoluteHalfWidth, d.Relative, d.RelativeHalfWidth, q.DeviationFromCorrectedMean[k],
                    q.VarianceRatio[k], q.CoefficientOfVariation[k], q.FanoFactor[k]];
                values[0][row] = cells[0];
                values[1][row] = cells[1];
                values[2][row] = cells[2];
                values[3][row] = cells[3];
                resolved[row] = q.Resolved[k] ? 1 : 0;
                values[4][row] = cells[4];
                values[5][row] = cells[5];
                values[6][row] = cells[6];
                values[7][row] = cells[7];
                modes[row] = q.Modes[k]?.Count ?? -1;
                row++;
            }
        }
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup([time, name, values[0], values[1], values[2], values[3], resolved, values[4], values[5], values[6], values[7], modes]);
        writer.Complete();
    }
}
