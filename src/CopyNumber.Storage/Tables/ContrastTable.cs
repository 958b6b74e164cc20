using CopyNumber.Analysis;

namespace CopyNumber.Storage;

/// <summary>
/// <c>contrast.parquet</c>: one row per (time, species or readout) with the deviation of the ensemble mean
/// from the rate equations and its confidence half-width, whether the sampling error resolves it, the
/// LNA variance and the first-order corrected mean with the variance ratio and the deviation from that mean,
/// noise measures, the mode count, and the phase of the schedule the time belongs to.
/// </summary>
public static class ContrastTable
{
    /// <summary>Column names in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames =
    [
        "time", "species", "deviation", "deviation_half_width", "relative_deviation", "relative_half_width",
        "resolved", "deviation_from_corrected_mean", "variance_ratio", "cv", "fano", "modes",
        "lna_variance", "corrected_mean", "phase",
    ];

    /// <summary>Writes the table atomically.</summary>
    public static void Write(string path, IReadOnlyList<QuantityContrast> quantities, IReadOnlyDictionary<string, string> metadata)
    {
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species" => ColumnType.String,
            "resolved" or "modes" or "phase" => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        // Time-major order like moments.parquet, so the two tables line up row by row for the same quantities.
        var longest = quantities.Count == 0 ? 0 : quantities.Max(q => q.Times.Count);
        var rows = Enumerable.Range(0, longest).SelectMany(k => quantities.Where(q => k < q.Times.Count).Select(q => (Q: q, K: k))).ToArray();
        double[] Doubles(Func<QuantityContrast, int, double> cell) => rows.Select(r => cell(r.Q, r.K)).ToArray();
        long[] Integers(Func<QuantityContrast, int, long> cell) => rows.Select(r => cell(r.Q, r.K)).ToArray();
        Array[] data =
        [
            Doubles((q, k) => q.Times[k]),
            rows.Select(r => r.Q.Name).ToArray(),
            Doubles((q, k) => q.Deviations[k].Absolute),
            Doubles((q, k) => q.Deviations[k].AbsoluteHalfWidth),
            Doubles((q, k) => q.Deviations[k].Relative),
            Doubles((q, k) => q.Deviations[k].RelativeHalfWidth),
            Integers((q, k) => q.Resolved[k] ? 1 : 0),
            Doubles((q, k) => q.DeviationFromCorrectedMean[k]),
            Doubles((q, k) => q.VarianceRatio[k]),
            Doubles((q, k) => q.CoefficientOfVariation[k]),
            Doubles((q, k) => q.FanoFactor[k]),
            Integers((q, k) => q.Modes[k]?.Count ?? -1),
            Doubles((q, k) => q.LnaVariance[k]),
            Doubles((q, k) => q.CorrectedMean[k]),
            Integers((q, k) => PhaseOf(q, k)),
        ];
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup(data);
        writer.Complete();
    }

    // The phase index of grid time k: 0 when the run has a single phase.
    private static long PhaseOf(QuantityContrast q, int k) =>
        q.Phases.FirstOrDefault(p => k >= p.Phase.FirstPoint && k < p.Phase.EndPoint)?.Phase.Index ?? 0;
}
