using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// <c>partition.parquet</c>, written when a run has its control ensemble of cells that split in halves
/// (<c>--partition-noise</c>, <see cref="PartitionControl"/>): one row per (time, count quantity). Columns:
/// <c>time</c>, <c>quantity</c>, <c>replicates</c>, <c>mean</c>, <c>variance</c>, <c>variance_se</c> (the run,
/// binomial partitioning), <c>control_replicates</c>, <c>control_mean</c>, <c>control_variance</c>,
/// <c>control_variance_se</c> (the control, halving), <c>partition_variance</c> (variance − control_variance, what
/// binomial partitioning adds, copies²), <c>partition_se</c>, <c>partition_share</c> (its share of the run's variance)
/// and <c>partition_share_se</c>. Standard errors from each sample's fourth moment; the two ensembles are independent.
/// </summary>
public static class PartitionTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "time", "quantity", "replicates", "mean", "variance", "variance_se", "control_replicates", "control_mean",
        "control_variance", "control_variance_se", "partition_variance", "partition_se", "partition_share", "partition_share_se",
    ];

    /// <summary>Writes the table of <paramref name="control"/>.</summary>
    public static void Write(string path, PartitionControl control, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(control);
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "quantity" => ColumnType.String,
            "replicates" or "control_replicates" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        var quantities = control.Quantities;
        var rows = control.Grid.Count * quantities.Count;
        var time = new double[rows];
        var name = new string[rows];
        var (replicates, controlReplicates) = (new long[rows], new long[rows]);
        var values = Enumerable.Range(0, 10).Select(_ => new double[rows]).ToArray();
        for (var k = 0; k < control.Grid.Count; k++)
            for (var q = 0; q < quantities.Count; q++)
            {
                var row = k * quantities.Count + q;
                var e = control.At(k, q);
                time[row] = control.Grid[k];
                name[row] = quantities[q].Name;
                (replicates[row], controlReplicates[row]) = (e.Model.Replicates, e.Control.Replicates);
                double[] cells = [e.Model.Mean, e.Model.Variance, e.Model.StandardError, e.Control.Mean, e.Control.Variance, e.Control.StandardError,
                    e.Added, e.AddedStandardError, e.Share, e.ShareStandardError];
                for (var c = 0; c < cells.Length; c++) values[c][row] = cells[c];
            }
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup([time, name, replicates, values[0], values[1], values[2], controlReplicates, .. values[3..]]);
        writer.Complete();
    }

    /// <summary>Reads a <c>partition.parquet</c> back, one split per quantity with its values at <paramref name="times"/> (NaN where the table has no row).</summary>
    /// <exception cref="RunFolderException">The table holds a time that is not in <paramref name="times"/>.</exception>
    internal static IReadOnlyList<StoredPartitionSplit> Read(ParquetTableReader table, IReadOnlyList<double> times) =>
        QuantityRows.Read(table, RunFiles.Partition, times,
                ["variance", "variance_se", "control_variance", "control_variance_se", "partition_variance", "partition_se", "partition_share", "partition_share_se"])
            .Select(q => new StoredPartitionSplit(q.Quantity, q.Columns[0], q.Columns[1], q.Columns[2], q.Columns[3], q.Columns[4], q.Columns[5], q.Columns[6], q.Columns[7]))
            .ToArray();
}

/// <summary>One count quantity's partitioning estimate as read from <c>partition.parquet</c>, by grid time (copies² unless a share).</summary>
/// <param name="Quantity">Species or count readout.</param>
/// <param name="Variance">The run's variance (binomial partitioning).</param>
/// <param name="VarianceStandardError">Its standard error.</param>
/// <param name="ControlVariance">The control's variance (cells split in halves).</param>
/// <param name="ControlStandardError">Its standard error.</param>
/// <param name="Added">Variance − control variance: what binomial partitioning adds beyond halving.</param>
/// <param name="AddedStandardError">Its standard error.</param>
/// <param name="Share">Added over the run's variance.</param>
/// <param name="ShareStandardError">Its standard error.</param>
public sealed record StoredPartitionSplit(
    string Quantity,
    double[] Variance,
    double[] VarianceStandardError,
    double[] ControlVariance,
    double[] ControlStandardError,
    double[] Added,
    double[] AddedStandardError,
    double[] Share,
    double[] ShareStandardError);
