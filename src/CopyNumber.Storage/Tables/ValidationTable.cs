using System.Globalization;
using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// <c>validation.parquet</c>, written by a tau-leaping run: one row per (time, count quantity) with the
/// exact validation sample's moments and, where compared, the simultaneous intervals for the relative
/// error of tau-leaping's mean and standard deviation (NaN where not compared). Columns: <c>time</c>,
/// <c>quantity</c>, <c>exact_replicates</c>, <c>exact_mean</c>, <c>exact_variance</c>,
/// <c>exact_fourth_central</c>, <c>mean_error</c>, <c>mean_lower</c>, <c>mean_upper</c>, <c>sd_error</c>,
/// <c>sd_lower</c>, <c>sd_upper</c>. Its footer holds the sample's wall time, so resuming and merging
/// reuse the sample rather than run it again, and recompute the intervals against the whole ensemble.
/// </summary>
public static class ValidationTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "time", "quantity", "exact_replicates", "exact_mean", "exact_variance", "exact_fourth_central",
        "mean_error", "mean_lower", "mean_upper", "sd_error", "sd_lower", "sd_upper",
    ];

    /// <summary>Footer key (after <see cref="Provenance.KeyPrefix"/>) of the sample's wall time in seconds.</summary>
    public const string SampleSecondsKey = "validation_sample_seconds";

    /// <summary>Writes the table for <paramref name="validation"/> of the ensemble <paramref name="leap"/>.</summary>
    public static void Write(string path, EnsembleResult leap, ValidationResult validation, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(leap);
        ArgumentNullException.ThrowIfNull(validation);
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "quantity" => ColumnType.String,
            "exact_replicates" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        var footer = new Dictionary<string, string>(metadata, StringComparer.Ordinal)
        {
            [Provenance.KeyPrefix + SampleSecondsKey] = validation.Sample.WallTime.TotalSeconds.ToString("R", CultureInfo.InvariantCulture),
        };
        using var writer = ParquetTableWriter.Create(path, columns, footer);
        var quantities = leap.CountQuantities;
        var rows = leap.Grid.Count * quantities.Count;
        var time = new double[rows];
        var name = new string[rows];
        var replicates = new long[rows];
        var values = Enumerable.Range(0, 9).Select(_ => new double[rows]).ToArray();
        var cells = validation.Cells.ToDictionary(c => (c.Time, c.Quantity));
        for (var k = 0; k < leap.Grid.Count; k++)
        {
            for (var q = 0; q < quantities.Count; q++)
            {
                var row = k * quantities.Count + q;
                var m = validation.Sample.Moments[row];
                time[row] = leap.Grid[k];
                name[row] = quantities[q].Name;
                replicates[row] = m.Count;
                cells.TryGetValue((leap.Grid[k], quantities[q].Name), out var cell);
                double[] row9 = [m.Mean, m.Variance, m.FourthCentral, .. Triple(cell?.Mean), .. Triple(cell?.StandardDeviation)];
                for (var c = 0; c < row9.Length; c++) values[c][row] = row9[c];
            }
        }
        writer.WriteRowGroup([time, name, replicates, .. values]);
        writer.Complete();
    }

    /// <summary>The stored exact sample of the run folder <paramref name="folder"/>, or null when it has none.</summary>
    /// <exception cref="RunFolderException">The file exists but is damaged or does not fit the grid and quantities.</exception>
    public static ExactSample? Read(string folder, EnsembleResult shape)
    {
        ArgumentNullException.ThrowIfNull(shape);
        var path = Path.Combine(folder, RunFiles.Validation);
        if (!File.Exists(path)) return null;
        using var reader = ParquetTableReader.Open(path);
        var seconds = double.Parse(reader.Require(Provenance.KeyPrefix + SampleSecondsKey), CultureInfo.InvariantCulture);
        var replicates = reader.Longs("exact_replicates");
        var mean = reader.Doubles("exact_mean");
        var variance = reader.Doubles("exact_variance");
        var fourth = reader.Doubles("exact_fourth_central");
        if (replicates.Length != shape.Grid.Count * shape.CountQuantities.Count) throw reader.Damaged("it does not have one row per grid time and count quantity of the run");
        var moments = new CellMoments[replicates.Length];
        for (var r = 0; r < moments.Length; r++) moments[r] = new CellMoments(replicates[r], mean[r], variance[r], fourth[r]);
        return new ExactSample(replicates.Length == 0 ? 0 : replicates.Max(), moments, TimeSpan.FromSeconds(seconds));
    }

    private static double[] Triple(RelativeErrorInterval? interval) =>
        interval is { } i ? [i.Estimate, i.Lower, i.Upper] : [double.NaN, double.NaN, double.NaN];
}
