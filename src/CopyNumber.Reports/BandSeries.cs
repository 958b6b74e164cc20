namespace CopyNumber.Reports;

/// <summary>
/// One species' ensemble over time, as drawn by <see cref="Figures.MeanWithBands"/>: the ensemble mean
/// with its empirical 5–95 % band, the deterministic rate-equation solution, optionally the linear noise
/// approximation's ±2σ band, and a few individual sample paths.
/// </summary>
/// <param name="Species">Species name, used in the title and axis label (any text; it is escaped where needed).</param>
/// <param name="Time">Time grid, in <paramref name="TimeUnit"/>, increasing. Every other array is aligned with it.</param>
/// <param name="Mean">Ensemble mean copy number at each time, in <paramref name="CountUnit"/>.</param>
/// <param name="Lower05">Empirical 5 % quantile of the copy number at each time.</param>
/// <param name="Upper95">Empirical 95 % quantile of the copy number at each time.</param>
/// <param name="RateEquation">Rate-equation (deterministic, mass-action) copy number at each time.</param>
/// <param name="LnaLower">Linear noise approximation: rate equation − 2σ at each time; null when not computed. Given together with <paramref name="LnaUpper"/>.</param>
/// <param name="LnaUpper">Linear noise approximation: rate equation + 2σ at each time; null when not computed.</param>
/// <param name="SamplePaths">Individual trajectories, each aligned with <paramref name="Time"/>; may be empty. Drawn as piecewise-constant steps, since a jump process holds its count between events.</param>
/// <param name="TimeUnit">Unit of time shown on the horizontal axis, e.g. "s" or "min".</param>
/// <param name="CountUnit">Unit shown on the vertical axis: "copies" for counts, empty for a real-valued readout.</param>
/// <remarks>
/// NaN in any array means "no value here": the point is skipped and a line or band is broken at it
/// rather than joined across the gap.
/// </remarks>
public sealed record BandSeries(
    string Species,
    double[] Time,
    double[] Mean,
    double[] Lower05,
    double[] Upper95,
    double[] RateEquation,
    double[]? LnaLower,
    double[]? LnaUpper,
    IReadOnlyList<double[]> SamplePaths,
    string TimeUnit = "time",
    string CountUnit = "copies")
{
    /// <summary>True for a count (a species, or a readout that is an integer combination of species): whole-number ticks.</summary>
    public bool IsCount { get; init; } = true;

    /// <summary>Times of the schedule's changes (model time units), each marked by a dotted vertical line; empty draws none.</summary>
    public IReadOnlyList<double> ScheduleChanges { get; init; } = [];
}
