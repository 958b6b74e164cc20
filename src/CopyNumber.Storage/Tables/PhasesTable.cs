using CopyNumber.Analysis;
using CopyNumber.Analysis.Phases;

namespace CopyNumber.Storage;

/// <summary>
/// <c>phases.parquet</c>: the verdicts per phase of the schedule, one row per (phase, species or readout), written by
/// <c>contrast</c> only when the run has more than one phase (docs/methods-analysis.md, section 4, "Verdicts per phase").
/// Each row gives the phase's span, its verdicts (labels and one 0/1 column per kind, named as in scan.parquet), the
/// false-alarm rate they were drawn at, and the numbers behind them over the phase's grid times.
/// </summary>
public static class PhasesTable
{
    /// <summary>Column names in file order; the 0/1 verdict columns are those of <see cref="ScanTable.VerdictColumns"/>.</summary>
    public static IReadOnlyList<string> ColumnNames { get; } =
    [
        "phase", "start", "end", "first_time", "last_time", "grid_times", "species", "verdicts",
        .. ScanTable.VerdictColumns,
        "false_alarm_rate", "min_replicates", "mean_shift_times_judged", "mean_shift_times_flagged",
        "largest_relative_deviation", "largest_relative_deviation_error", "largest_relative_deviation_time",
        "final_relative_deviation", "final_relative_deviation_error", "final_cv", "final_variance_ratio", "final_modes", "final_p_zero",
        "reasons",
    ];

    /// <summary>True when <paramref name="quantities"/> carry verdicts per phase, i.e. the table has rows to write.</summary>
    public static bool Applies(IReadOnlyList<QuantityContrast> quantities) => quantities.Any(q => q.Phases.Count > 1);

    /// <summary>Writes the table atomically: phases in time order, quantities in table order within a phase.</summary>
    public static void Write(string path, IReadOnlyList<QuantityContrast> quantities, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(quantities);
        var rows = quantities.SelectMany(q => q.Phases.Select(p => (Quantity: q.Name, Phase: p)))
            .OrderBy(r => r.Phase.Phase.Index).ToArray(); // stable: quantities keep their order within a phase
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n switch
        {
            "species" or "verdicts" or "reasons" => ColumnType.String,
            "phase" or "grid_times" or "min_replicates" or "mean_shift_times_judged" or "mean_shift_times_flagged" or "final_modes" => ColumnType.Int64,
            _ when ScanTable.VerdictColumns.Contains(n) => ColumnType.Int64,
            _ => ColumnType.Double,
        })).ToArray();
        var data = new List<Array>
        {
            rows.Select(r => (long)r.Phase.Phase.Index).ToArray(),
            rows.Select(r => r.Phase.Phase.Start).ToArray(),
            rows.Select(r => r.Phase.Phase.End).ToArray(),
            rows.Select(r => r.Phase.Contrast.Times[0]).ToArray(),
            rows.Select(r => r.Phase.Contrast.Times[^1]).ToArray(),
            rows.Select(r => (long)r.Phase.Contrast.Times.Count).ToArray(),
            rows.Select(r => r.Quantity).ToArray(),
            rows.Select(r => string.Join(", ", r.Phase.Contrast.Verdicts.Select(v => v.Label))).ToArray(),
        };
        foreach (var kind in Enum.GetValues<VerdictKind>())
            data.Add(rows.Select(r => r.Phase.Contrast.Verdicts.Any(v => v.Kind == kind) ? 1L : 0L).ToArray());
        data.Add(rows.Select(r => r.Phase.FalseAlarmRate).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.MinimumReplicates).ToArray());
        data.Add(rows.Select(r => (long)r.Phase.Contrast.MeanShiftTimesJudged).ToArray());
        data.Add(rows.Select(r => (long)r.Phase.Contrast.MeanShiftTimesFlagged).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.LargestResolvedRelativeDeviation?.Relative ?? double.NaN).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.LargestResolvedRelativeDeviation?.RelativeHalfWidth ?? double.NaN).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.LargestResolvedRelativeDeviation?.Time ?? double.NaN).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.Deviations[^1].Relative).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.Deviations[^1].RelativeHalfWidth).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.CoefficientOfVariation[^1]).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.VarianceRatio[^1]).ToArray());
        data.Add(rows.Select(r => (long)(r.Phase.Contrast.Modes[^1]?.Count ?? -1)).ToArray());
        data.Add(rows.Select(r => r.Phase.Contrast.FinalProbabilityOfZero).ToArray());
        data.Add(rows.Select(r => string.Join(" | ", r.Phase.Contrast.Verdicts.Select(v => $"{v.Label}: {v.Sentence}"))).ToArray());
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        writer.WriteRowGroup(data);
        writer.Complete();
    }
}
