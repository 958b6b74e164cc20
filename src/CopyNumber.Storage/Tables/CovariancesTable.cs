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
}
