using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// <c>covariances.parquet</c>: one row per (time, species pair) for the pairs the run accumulated (every pair of a network
/// of at most <see cref="SpeciesPair.AllPairsUpTo"/> species, or those named by <c>--covariance-pairs</c>). Columns:
/// <c>time</c>, <c>species_a</c>, <c>species_b</c>, <c>replicates</c>, <c>covariance</c> (unbiased, copies²),
/// <c>covariance_se</c> (normal-theory standard error, <see cref="CovarianceEstimate.StandardError"/>), <c>correlation</c>.
/// Time-major, pairs in the order accumulated; NaN where fewer than 2 replicates were recorded.
/// </summary>
public static class CovariancesTable
{
    /// <summary>Column names in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
        ["time", "species_a", "species_b", "replicates", "covariance", "covariance_se", "correlation"];

    /// <summary>Writes the table atomically.</summary>
    public static void Write(string path, EnsembleResult result, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(result);
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species_a" or "species_b" => ColumnType.String,
            "replicates" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        var pairs = result.Pairs;
        var rows = result.Grid.Count * pairs.Count;
        var time = new double[rows];
        var first = new string[rows];
        var second = new string[rows];
        var replicates = new long[rows];
        var covariance = new double[rows];
        var error = new double[rows];
        var correlation = new double[rows];
        for (var k = 0; k < result.Grid.Count; k++)
            for (var p = 0; p < pairs.Count; p++)
            {
                var row = k * pairs.Count + p;
                var estimate = result.Covariance(k, p);
                time[row] = result.Grid[k];
                first[row] = result.Quantities[pairs[p].First].Name;
                second[row] = result.Quantities[pairs[p].Second].Name;
                replicates[row] = estimate.Replicates;
                covariance[row] = estimate.Covariance;
                error[row] = estimate.StandardError;
                correlation[row] = estimate.Correlation;
            }
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup([time, first, second, replicates, covariance, error, correlation]);
        writer.Complete();
    }

    /// <summary>Reads the table back, one series per pair with its values at <paramref name="times"/> (NaN where it has no row).</summary>
    /// <exception cref="RunFolderException">The table holds a time that is not in <paramref name="times"/>.</exception>
    internal static IReadOnlyList<StoredCovariance> Read(ParquetTableReader table, IReadOnlyList<double> times)
    {
        var index = times.Select((t, k) => (t, k)).ToDictionary(p => p.t, p => p.k);
        var time = table.Doubles("time");
        var first = table.Strings("species_a");
        var second = table.Strings("species_b");
        var replicates = table.Longs("replicates");
        var covariance = table.Doubles("covariance");
        var error = table.Doubles("covariance_se");
        var pairs = new Dictionary<(string, string), StoredCovariance>();
        var order = new List<(string, string)>();
        for (var row = 0; row < time.Length; row++)
        {
            if (!index.TryGetValue(time[row], out var k))
                throw table.Damaged($"{RunFiles.Covariances} has time {time[row].ToString("R", System.Globalization.CultureInfo.InvariantCulture)}, which the run's grid does not have");
            var key = (first[row], second[row]);
            if (!pairs.TryGetValue(key, out var pair))
            {
                pair = new StoredCovariance(first[row], second[row], new long[times.Count],
                    Enumerable.Repeat(double.NaN, times.Count).ToArray(), Enumerable.Repeat(double.NaN, times.Count).ToArray());
                pairs.Add(key, pair);
                order.Add(key);
            }
            pair.Replicates[k] = replicates[row];
            pair.Covariance[k] = covariance[row];
            pair.StandardError[k] = error[row];
        }
        return order.Select(key => pairs[key]).ToArray();
    }
}

/// <summary>One species pair's covariance as read from <c>covariances.parquet</c>, by grid time.</summary>
/// <param name="First">The first species.</param>
/// <param name="Second">The second species.</param>
/// <param name="Replicates">Replicates behind each value.</param>
/// <param name="Covariance">The unbiased sample covariance, copies².</param>
/// <param name="StandardError">Its normal-theory standard error, copies².</param>
public sealed record StoredCovariance(string First, string Second, long[] Replicates, double[] Covariance, double[] StandardError);
