using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// <c>noise.parquet</c>, written when some parameter varies per replicate: one row per (time, quantity) with
/// the law-of-total-variance split of the quantity's variance (<see cref="NoiseDecomposition"/>). Columns:
/// <c>time</c>, <c>quantity</c>, <c>replicates_per_draw</c>, <c>pairs</c> (pairs of draw groups behind the
/// estimates), <c>mean</c>, <c>intrinsic_variance</c>, <c>intrinsic_se</c>, <c>extrinsic_variance</c>,
/// <c>extrinsic_se</c>, and the squared coefficients of variation <c>intrinsic_cv2</c> and
/// <c>extrinsic_cv2</c> (each part over the squared mean; their sum is the total CV², Swain, Elowitz &amp;
/// Siggia 2002).
/// </summary>
public static class NoiseTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "time", "quantity", "replicates_per_draw", "pairs", "mean", "intrinsic_variance", "intrinsic_se",
        "extrinsic_variance", "extrinsic_se", "intrinsic_cv2", "extrinsic_cv2",
    ];

    /// <summary>Writes the table for <paramref name="result"/>, which must carry <see cref="EnsembleResult.Noise"/>.</summary>
    public static void Write(string path, EnsembleResult result, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(result);
        var noise = result.Noise ?? throw new ArgumentException("the result has no noise decomposition", nameof(result));
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "quantity" => ColumnType.String,
            "replicates_per_draw" or "pairs" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        var quantities = noise.Quantities;
        var rows = result.Grid.Count * quantities.Count;
        var time = new double[rows];
        var name = new string[rows];
        var perDraw = new long[rows];
        var pairs = new long[rows];
        var values = Enumerable.Range(0, 7).Select(_ => new double[rows]).ToArray();
        for (var k = 0; k < result.Grid.Count; k++)
            for (var q = 0; q < quantities.Count; q++)
            {
                var row = k * quantities.Count + q;
                var (intrinsic, extrinsic) = (noise.Intrinsic(k, q), noise.Extrinsic(k, q));
                var mean = NoiseDecomposition.MeanOf(result, k, q);
                time[row] = result.Grid[k];
                name[row] = quantities[q].Name;
                perDraw[row] = noise.ReplicatesPerDraw;
                pairs[row] = intrinsic.Count;
                double[] cells = [mean, intrinsic.Mean, intrinsic.StandardError, extrinsic.Mean, extrinsic.StandardError,
                    intrinsic.Mean / (mean * mean), extrinsic.Mean / (mean * mean)];
                for (var c = 0; c < cells.Length; c++) values[c][row] = cells[c];
            }
        writer.WriteRowGroup([time, name, perDraw, pairs, .. values]);
        writer.Complete();
    }

    /// <summary>
    /// Reads a <c>noise.parquet</c> back, one split per quantity with its values at <paramref name="times"/>
    /// (NaN where the table has no row).
    /// </summary>
    /// <exception cref="RunFolderException">The table holds a time that is not in <paramref name="times"/>.</exception>
    internal static IReadOnlyList<StoredNoiseSplit> Read(ParquetTableReader table, IReadOnlyList<double> times) =>
        QuantityRows.Read(table, RunFiles.Noise, times, ["mean", "intrinsic_variance", "intrinsic_se", "extrinsic_variance", "extrinsic_se"], ["replicates_per_draw"])
            .Select(q => new StoredNoiseSplit(q.Quantity, q.Labels[0], q.Columns[0], q.Columns[1], q.Columns[2], q.Columns[3], q.Columns[4])).ToArray();
}

/// <summary>
/// One quantity's variance split as read from <c>noise.parquet</c>, by grid time: the law of total variance
/// Var = E[Var | cell] + Var[E | cell] (Swain, Elowitz &amp; Siggia 2002), each part with its standard error.
/// </summary>
/// <param name="Quantity">Species or readout.</param>
/// <param name="ReplicatesPerDraw">Replicates that share one parameter draw (one cell).</param>
/// <param name="Mean">The ensemble mean, copies.</param>
/// <param name="IntrinsicVariance">The within-cell part, copies².</param>
/// <param name="IntrinsicStandardError">Its standard error.</param>
/// <param name="ExtrinsicVariance">The between-cell part, copies² (an unbiased estimate; it may be slightly negative by chance when the part is small).</param>
/// <param name="ExtrinsicStandardError">Its standard error.</param>
public sealed record StoredNoiseSplit(
    string Quantity,
    long ReplicatesPerDraw,
    double[] Mean,
    double[] IntrinsicVariance,
    double[] IntrinsicStandardError,
    double[] ExtrinsicVariance,
    double[] ExtrinsicStandardError);
