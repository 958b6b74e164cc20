namespace CopyNumber.Reports;

/// <summary>
/// The copy-number distribution of one species at one time, as drawn by <see cref="Figures.Histograms"/>.
/// </summary>
/// <param name="Species">Species name.</param>
/// <param name="Time">The time of the snapshot, in <paramref name="TimeUnit"/>.</param>
/// <param name="Counts">Copy numbers with a probability (need not be sorted or contiguous).</param>
/// <param name="Probabilities">Probability of each entry of <paramref name="Counts"/>, aligned with it; NaN entries are skipped.</param>
/// <param name="RateEquationValue">Rate-equation copy number at <paramref name="Time"/>, drawn as a vertical line; NaN draws none.</param>
/// <param name="TimeUnit">Unit of <paramref name="Time"/> shown in the panel title.</param>
/// <param name="CountUnit">Unit shown on the horizontal axis: "copies" for counts, empty for a real-valued readout.</param>
public sealed record HistogramSnapshot(
    string Species,
    double Time,
    long[] Counts,
    double[] Probabilities,
    double RateEquationValue,
    string TimeUnit = "time",
    string CountUnit = "copies")
{
    /// <summary>True for a count (whole-number ticks); false for a real-valued readout.</summary>
    public bool IsCount { get; init; } = true;
}
