using CopyNumber.Ensembles;

namespace CopyNumber.Storage;

/// <summary>
/// <c>switching.parquet</c>, written when the run followed the modes of some species (<c>--switching</c>, or cores
/// from the rate equations' stable steady states): one row per (quantity, mode). Columns: <c>quantity</c>,
/// <c>mode</c> ("low" or "high"), <c>core_low_max</c> and <c>core_high_min</c> (the cores x ≤ low and x ≥ high,
/// copies), <c>replicates</c>, <c>excluded_replicates</c> (stopped at the event limit), <c>never_entered</c>
/// (replicates that entered neither core), <c>residence_mean</c> and <c>residence_se</c> (model time units),
/// <c>completed_residences</c>, <c>censored_residences</c> (replicates whose last residence, in this mode, was cut
/// by the end of the run), <c>time_fraction</c> (share of the replicates' time attributed to the mode),
/// <c>switches_mean</c> and <c>switches_se</c> (switches of the quantity per replicate over [0, T], the same on both
/// rows), <c>switching_rate</c> (switches per model time unit) and <c>span</c> (T). The residence estimator is
/// total time in the mode over completed residences (see <see cref="ModeSwitching"/>), recorded in the footer key
/// <c>residence_estimator</c>.
/// </summary>
public static class SwitchingTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "quantity", "mode", "core_low_max", "core_high_min", "replicates", "excluded_replicates", "never_entered",
        "residence_mean", "residence_se", "completed_residences", "censored_residences", "time_fraction",
        "switches_mean", "switches_se", "switching_rate", "span",
    ];

    /// <summary>What the footer says of the residence estimator.</summary>
    public const string Estimator =
        "mean residence = total time in the mode / completed residences (the residence running at T is censored: its time counts, its end does not; " +
        "maximum likelihood for exponential residences); standard error of the ratio estimator over replicates (delta method)";

    /// <summary>Writes the table atomically.</summary>
    public static void Write(string path, IReadOnlyList<ModeSwitching> switching, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(switching);
        ArgumentNullException.ThrowIfNull(metadata);
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "quantity" or "mode" => ColumnType.String,
            "core_low_max" or "core_high_min" or "replicates" or "excluded_replicates" or "never_entered"
                or "completed_residences" or "censored_residences" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        var footer = new Dictionary<string, string>(metadata) { ["residence_estimator"] = Estimator };
        using var writer = ParquetTableWriter.Create(path, columns, footer);
        var rows = 2 * switching.Count;
        var quantity = new string[rows];
        var mode = new string[rows];
        var longs = Enumerable.Range(0, 7).Select(_ => new long[rows]).ToArray();
        var doubles = Enumerable.Range(0, 7).Select(_ => new double[rows]).ToArray();
        for (var q = 0; q < switching.Count; q++)
        {
            var s = switching[q];
            for (var m = 0; m < 2; m++)
            {
                var row = 2 * q + m;
                quantity[row] = s.Species;
                mode[row] = m == 0 ? "low" : "high";
                long[] whole = [s.Low, s.High, s.Replicates, s.Excluded, s.NeverEntered, s.Mode(m).Exits, s.Mode(m).Censored];
                for (var c = 0; c < whole.Length; c++) longs[c][row] = whole[c];
                double[] real = [s.MeanResidence(m), s.ResidenceStandardError(m)];
                doubles[0][row] = real[0];
                doubles[1][row] = real[1];
                doubles[2][row] = s.TimeFraction(m);
                doubles[3][row] = s.MeanSwitches;
                doubles[4][row] = s.SwitchesStandardError;
                doubles[5][row] = s.SwitchingRate;
                doubles[6][row] = s.Span;
            }
        }
        // File order: quantity, mode, 5 whole columns, residence mean and se, 2 whole columns, the rest.
        writer.WriteRowGroup([quantity, mode, longs[0], longs[1], longs[2], longs[3], longs[4], doubles[0], doubles[1], longs[5], longs[6],
            doubles[2], doubles[3], doubles[4], doubles[5], doubles[6]]);
        writer.Complete();
    }
}
