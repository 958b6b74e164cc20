namespace CopyNumber.Reports;

/// <summary>
/// How far one species' ensemble mean lies from the rate equation as the system size grows, as drawn by
/// <see cref="Figures.SweepLogLog"/>. For mass-action networks the deviation of the mean from the rate
/// equation shrinks like 1/Ω (Grima 2010, J. Chem. Phys. 133:035101), which the figure shows as a
/// reference slope.
/// </summary>
/// <param name="Species">Species name, used in the legend.</param>
/// <param name="Sizes">System sizes Ω (dimensionless volume scale), one per sweep point; must be positive to be drawn.</param>
/// <param name="RelativeDeviation">
/// Size of the relative deviation |mean − rate equation| / rate equation at each size (dimensionless).
/// NaN means the deviation was not resolved above the sampling error; NaN, zero and negative values are
/// not drawn on the logarithmic axis.
/// </param>
/// <param name="DeviationStdError">Standard error of each deviation (same units), drawn as ±1 SE bars; NaN draws no bar.</param>
public sealed record SweepSeries(
    string Species,
    double[] Sizes,
    double[] RelativeDeviation,
    double[] DeviationStdError);
