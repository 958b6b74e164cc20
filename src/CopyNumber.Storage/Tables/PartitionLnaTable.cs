using CopyNumber.Analysis;

namespace CopyNumber.Storage;

/// <summary>
/// <c>partition-lna.parquet</c>, written by <c>contrast</c> when the cells divide: the linear noise approximation's
/// variance of each species and readout split by its sources (<see cref="Analysis.Noise.LnaNoiseSources"/>), one row
/// per (time, quantity). Columns: <c>time</c>, <c>quantity</c>, <c>lna_variance</c> (C, copies²),
/// <c>reactions_variance</c> (C_r, fed by the reactions' noise), <c>partitioning_variance</c> (C_p, fed by the
/// partitioning variance of the divisions) and <c>partitioning_share</c> (C_p/C; NaN where C = 0). C = C_r + C_p to rounding.
/// </summary>
public static class PartitionLnaTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames = ["time", "quantity", "lna_variance", "reactions_variance", "partitioning_variance", "partitioning_share"];

    /// <summary>Writes the table of <paramref name="solution"/>, which must carry <see cref="SystemSizeExpansionSolution.Sources"/>.</summary>
    public static void Write(string path, SystemSizeExpansionSolution solution, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(solution);
        var sources = solution.Sources ?? throw new ArgumentException("the solution has no split by source", nameof(solution));
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n == "quantity" ? ColumnType.String : ColumnType.Double)).ToArray();
        var rows = solution.Grid.Count * solution.Columns.Count;
        var time = new double[rows];
        var name = new string[rows];
        var values = Enumerable.Range(0, 4).Select(_ => new double[rows]).ToArray();
        for (var k = 0; k < solution.Grid.Count; k++)
            for (var c = 0; c < solution.Columns.Count; c++)
            {
                var row = k * solution.Columns.Count + c;
                var total = solution.Variance(k, c);
                time[row] = solution.Grid[k];
                name[row] = solution.Columns[c];
                (values[0][row], values[1][row], values[2][row]) = (total, sources.Reactions(k, c), sources.Partitioning(k, c));
                values[3][row] = total > 0 ? sources.Partitioning(k, c) / total : double.NaN;
            }
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup([time, name, .. values]);
        writer.Complete();
    }
}
