using CopyNumber.Storage;
using CopyNumber.Analysis;

namespace CopyNumber.Runs;

/// <summary><c>sweep.parquet</c>: one row per (size, species or readout) of a system-size sweep.</summary>
public static class SweepTable
{
    /// <summary>Column names in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
        ["size", "species", "relative_deviation", "relative_half_width", "cv", "variance_ratio", "verdicts", "adequate_from"];

    /// <summary>Writes the table atomically; <c>adequate_from</c> is NaN when no tried size is adequate.</summary>
    public static void Write(string path, SizeSweep sweep, IReadOnlyDictionary<string, string> metadata)
    {
        ColumnSpec[] columns =
        [
            new("size", ColumnType.Double), new("species", ColumnType.String), new("relative_deviation", ColumnType.Double),
            new("relative_half_width", ColumnType.Double), new("cv", ColumnType.Double), new("variance_ratio", ColumnType.Double),
            new("verdicts", ColumnType.String), new("adequate_from", ColumnType.Double),
        ];
        var p = sweep.Points;
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup(
        [
            p.Select(x => x.Size).ToArray(), p.Select(x => x.Quantity).ToArray(), p.Select(x => x.RelativeDeviation).ToArray(),
            p.Select(x => x.RelativeHalfWidth).ToArray(), p.Select(x => x.CoefficientOfVariation).ToArray(), p.Select(x => x.VarianceRatio).ToArray(),
            p.Select(x => x.Verdicts).ToArray(), p.Select(x => sweep.AdequateFrom[x.Quantity] ?? double.NaN).ToArray(),
        ]);
        writer.Complete();
    }
}
