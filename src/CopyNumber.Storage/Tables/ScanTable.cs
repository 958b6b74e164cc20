namespace CopyNumber.Storage;

/// <summary>
/// One row of <c>scan.parquet</c>: one quantity at one scan point. Deviations are in copies (relative ones
/// as fractions of the rate equations' value); NaN where a measure is not defined (docs/methods-analysis.md).
/// </summary>
/// <param name="Point">The point's number, from 0 in design order.</param>
/// <param name="Values">The point's value of each varied name, in the scan's axis order.</param>
/// <param name="Quantity">Species or readout.</param>
/// <param name="Verdicts">The verdict labels, comma-separated, at the map's error rate.</param>
/// <param name="Flags">1/0 per verdict kind, in the order of <see cref="ScanTable.VerdictColumns"/>.</param>
/// <param name="LargestDeviation">Largest resolved |mean − rate equations| over the grid (copies); NaN when none is resolved.</param>
/// <param name="LargestDeviationError">Its confidence half-width z·SE (copies).</param>
/// <param name="LargestRelativeDeviation">Largest resolved |relative deviation|; NaN when none.</param>
/// <param name="LargestRelativeDeviationError">Its half-width.</param>
/// <param name="FinalRelativeDeviation">(mean − rate equations)/rate equations at the final time, signed; NaN below the floor.</param>
/// <param name="FinalRelativeDeviationError">Its half-width z·SE/|φ|.</param>
/// <param name="CoefficientOfVariation">CV at the final time.</param>
/// <param name="LnaRatio">Ensemble variance over the LNA variance at the final time.</param>
/// <param name="Modes">Modes at the final time (0 when no histogram).</param>
/// <param name="ZeroFraction">P(0) at the final time.</param>
/// <param name="StableSteadyStates">Stable steady states of the rate equations at the point (−1 when not determined).</param>
/// <param name="SteadyStatesText">Those steady states in words (the quantity's value at each).</param>
/// <param name="UnsettledStarts">Starting points whose rate-equation trajectory never settled (a limit cycle, a slow drift or growth); 0 when all settled.</param>
/// <param name="Folder">The point's run folder, relative to the scan folder.</param>
/// <param name="RateEquationBehaviour">What the rate equations do at the point after their transient: <c>limit cycle</c>,
/// <c>damped oscillation</c>, <c>settles</c>, or empty when not analysed (docs/methods-analysis.md, section 7).</param>
/// <param name="RateEquationPeriod">The period of that cycle (or of the focus's ringing, 2π/|Im λ|), in model time units; NaN otherwise.</param>
public sealed record ScanCell(
    long Point, IReadOnlyList<double> Values, string Quantity, string Verdicts, IReadOnlyList<long> Flags,
    double LargestDeviation, double LargestDeviationError, double LargestRelativeDeviation, double LargestRelativeDeviationError,
    double FinalRelativeDeviation, double FinalRelativeDeviationError,
    double CoefficientOfVariation, double LnaRatio, long Modes, double ZeroFraction,
    long StableSteadyStates, string SteadyStatesText, long UnsettledStarts, string Folder,
    string RateEquationBehaviour = "", double RateEquationPeriod = double.NaN);

/// <summary><c>scan.parquet</c>: one row per scan point and quantity, points ascending, quantities in the network's order.</summary>
public static class ScanTable
{
    /// <summary>The 0/1 verdict columns, in file order.</summary>
    public static readonly IReadOnlyList<string> VerdictColumns =
        ["adequate", "mean_shifted", "noise_dominated", "multimodal", "extinction_prone", "too_few_replicates",
         "cycles_with_rate_equations", "cycle_lost_to_noise", "noise_driven_ringing"];

    /// <summary>A varied name's column, <c>vary_NAME</c>.</summary>
    public static string ValueColumn(string name) => "vary_" + name;

    /// <summary>Writes the table atomically; <paramref name="names"/> are the varied names in axis order.</summary>
    public static void Write(string path, IReadOnlyList<string> names, IReadOnlyList<ScanCell> cells, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(names);
        ArgumentNullException.ThrowIfNull(cells);
        var columns = new List<ColumnSpec> { new("point", ColumnType.Int64) };
        columns.AddRange(names.Select(n => new ColumnSpec(ValueColumn(n), ColumnType.Double)));
        columns.Add(new("quantity", ColumnType.String));
        columns.Add(new("verdicts", ColumnType.String));
        columns.AddRange(VerdictColumns.Select(v => new ColumnSpec(v, ColumnType.Int64)));
        foreach (var name in DoubleColumns) columns.Add(new(name, ColumnType.Double));
        columns.Add(new("modes", ColumnType.Int64));
        columns.Add(new("p_zero", ColumnType.Double));
        columns.Add(new("stable_steady_states", ColumnType.Int64));
        columns.Add(new("steady_states", ColumnType.String));
        columns.Add(new("unsettled_starts", ColumnType.Int64));
        columns.Add(new("folder", ColumnType.String));
        columns.Add(new("rate_equations_behaviour", ColumnType.String));
        columns.Add(new("rate_equations_period", ColumnType.Double));

        var data = new List<Array> { cells.Select(c => c.Point).ToArray() };
        for (var a = 0; a < names.Count; a++) data.Add(cells.Select(c => c.Values[a]).ToArray());
        data.Add(cells.Select(c => c.Quantity).ToArray());
        data.Add(cells.Select(c => c.Verdicts).ToArray());
        for (var v = 0; v < VerdictColumns.Count; v++) data.Add(cells.Select(c => c.Flags[v]).ToArray());
        data.Add(cells.Select(c => c.LargestDeviation).ToArray());
        data.Add(cells.Select(c => c.LargestDeviationError).ToArray());
        data.Add(cells.Select(c => c.LargestRelativeDeviation).ToArray());
        data.Add(cells.Select(c => c.LargestRelativeDeviationError).ToArray());
        data.Add(cells.Select(c => c.FinalRelativeDeviation).ToArray());
        data.Add(cells.Select(c => c.FinalRelativeDeviationError).ToArray());
        data.Add(cells.Select(c => c.CoefficientOfVariation).ToArray());
        data.Add(cells.Select(c => c.LnaRatio).ToArray());
        data.Add(cells.Select(c => c.Modes).ToArray());
        data.Add(cells.Select(c => c.ZeroFraction).ToArray());
        data.Add(cells.Select(c => c.StableSteadyStates).ToArray());
        data.Add(cells.Select(c => c.SteadyStatesText).ToArray());
        data.Add(cells.Select(c => c.UnsettledStarts).ToArray());
        data.Add(cells.Select(c => c.Folder).ToArray());
        data.Add(cells.Select(c => c.RateEquationBehaviour).ToArray());
        data.Add(cells.Select(c => c.RateEquationPeriod).ToArray());
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup(data);
        writer.Complete();
    }

    private static readonly string[] DoubleColumns =
    [
        "largest_deviation", "largest_deviation_error", "largest_relative_deviation", "largest_relative_deviation_error",
        "final_relative_deviation", "final_relative_deviation_error", "cv", "lna_ratio",
    ];
}
