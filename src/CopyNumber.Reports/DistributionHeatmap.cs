namespace CopyNumber.Reports;

/// <summary>
/// The copy-number distribution of one species over time, as drawn by <see cref="Figures.Heatmap"/>:
/// time runs along the horizontal axis, copy number up the vertical axis, colour is probability.
/// </summary>
/// <param name="Species">Species name.</param>
/// <param name="Time">Time grid, in <paramref name="TimeUnit"/>, increasing; may be uneven.</param>
/// <param name="MinCount">Smallest copy number represented (the first column of <paramref name="Probability"/>).</param>
/// <param name="MaxCount">Largest copy number represented; at least <paramref name="MinCount"/>.</param>
/// <param name="Probability">
/// Probability indexed [time index, count − <paramref name="MinCount"/>], so of size
/// Time.Length × (MaxCount − MinCount + 1). NaN cells are left uncoloured.
/// </param>
/// <param name="RateEquation">Optional rate-equation copy number aligned with <paramref name="Time"/>, drawn over the map.</param>
/// <param name="TimeUnit">Unit of time shown on the horizontal axis.</param>
/// <param name="CountUnit">Unit of the copy number shown on the vertical axis.</param>
public sealed record DistributionHeatmap(
    string Species,
    double[] Time,
    long MinCount,
    long MaxCount,
    double[,] Probability,
    double[]? RateEquation = null,
    string TimeUnit = "time",
    string CountUnit = "copies")
{
    /// <summary>Times of the schedule's changes (model time units), each marked by a dotted vertical line; empty draws none.</summary>
    public IReadOnlyList<double> ScheduleChanges { get; init; } = [];
}
