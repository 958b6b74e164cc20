using System.Globalization;

namespace CopyNumber.Storage;

/// <summary>
/// Reads a table of one row per (time, quantity) back as one series per quantity on the run's grid: the one reader of
/// the long tables a run writes per quantity (noise.parquet, partition.parquet).
/// </summary>
internal static class QuantityRows
{
    /// <summary>
    /// Per quantity, in the order of first appearance: the quantity's name, the first row's value of each of
    /// <paramref name="longColumns"/>, and each of <paramref name="doubleColumns"/> at <paramref name="times"/> (NaN where the table has no row).
    /// </summary>
    /// <exception cref="RunFolderException">The table holds a time that is not in <paramref name="times"/>.</exception>
    public static IReadOnlyList<(string Quantity, long[] Labels, double[][] Columns)> Read(ParquetTableReader table, string file, IReadOnlyList<double> times,
        IReadOnlyList<string> doubleColumns, IReadOnlyList<string>? longColumns = null)
    {
        ArgumentNullException.ThrowIfNull(table);
        var index = times.Select((t, k) => (t, k)).ToDictionary(p => p.t, p => p.k);
        var time = table.Doubles("time");
        var name = table.Strings("quantity");
        var labels = (longColumns ?? []).Select(c => table.Longs(c)).ToArray();
        var values = doubleColumns.Select(c => table.Doubles(c)).ToArray();
        var series = new Dictionary<string, (long[] Labels, double[][] Columns)>();
        var order = new List<string>();
        for (var row = 0; row < time.Length; row++)
        {
            if (!index.TryGetValue(time[row], out var k))
                throw table.Damaged($"{file} has time {time[row].ToString("R", CultureInfo.InvariantCulture)}, which the run's grid does not have");
            if (!series.TryGetValue(name[row], out var one))
            {
                one = (labels.Select(l => l[row]).ToArray(), doubleColumns.Select(_ => Enumerable.Repeat(double.NaN, times.Count).ToArray()).ToArray());
                series.Add(name[row], one);
                order.Add(name[row]);
            }
            for (var c = 0; c < values.Length; c++) one.Columns[c][k] = values[c][row];
        }
        return order.Select(n => (n, series[n].Labels, series[n].Columns)).ToArray();
    }
}
