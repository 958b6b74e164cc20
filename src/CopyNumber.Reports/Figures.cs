namespace CopyNumber.Reports;

/// <summary>
/// The figures of the "contrast" and "sweep" reports, each returned as the bytes of a PNG image of the
/// requested size in pixels (each side between 200 and 8000). Missing values (NaN) are skipped and break
/// lines at the gap; a figure with nothing to draw still renders, with a note saying so. Input of the
/// wrong shape (arrays not aligned, both LNA bounds not given, …) raises <see cref="ReportException"/>
/// with a message naming the species and array at fault. Each call builds and renders its own plot.
/// </summary>
public static class Figures
{
    /// <summary>
    /// Ensemble mean over time with its 5–95 % band (filled), the rate equation (solid line), the linear
    /// noise approximation's ±2σ band (dashed outline, when given) and the sample paths (thin grey steps).
    /// Horizontal axis: time in <see cref="BandSeries.TimeUnit"/>; vertical: copy number in
    /// <see cref="BandSeries.CountUnit"/>.
    /// </summary>
    /// <param name="series">The species' ensemble summary.</param>
    /// <param name="width">Image width in pixels.</param>
    /// <param name="height">Image height in pixels.</param>
    /// <returns>PNG bytes.</returns>
    public static byte[] MeanWithBands(BandSeries series, int width = 900, int height = 500) =>
        MeanBandFigure.Render(series, width, height).Png;

    /// <summary>
    /// One panel per snapshot (laid out in a grid, all panels on the same axes), each a bar chart of
    /// probability against copy number with the rate-equation value as a vertical line. The image size
    /// is that of the whole grid. An empty list gives a single empty panel saying so.
    /// </summary>
    /// <param name="snapshots">Distributions to show, in the order to show them.</param>
    /// <param name="width">Image width in pixels.</param>
    /// <param name="height">Image height in pixels.</param>
    /// <returns>PNG bytes.</returns>
    public static byte[] Histograms(IReadOnlyList<HistogramSnapshot> snapshots, int width = 900, int height = 500) =>
        HistogramFigure.Render(snapshots, width, height).Png;

    /// <summary>
    /// Probability of each copy number over time on the viridis colour map, with a colour bar labelled
    /// "probability" scaled from 0 to the largest probability, and the rate equation over it when given.
    /// An uneven time grid is drawn with each time owning the interval between its neighbours' midpoints.
    /// </summary>
    /// <param name="heatmap">The distribution over time.</param>
    /// <param name="width">Image width in pixels.</param>
    /// <param name="height">Image height in pixels.</param>
    /// <returns>PNG bytes.</returns>
    public static byte[] Heatmap(DistributionHeatmap heatmap, int width = 900, int height = 500) =>
        HeatmapFigure.Render(heatmap, width, height).Png;

    /// <summary>
    /// Relative deviation from the rate equation against system size on log–log axes (decade ticks), one
    /// marker shape and colour per species, ±1 standard-error bars, and a dashed slope −1 line (∝ 1/Ω)
    /// through the centroid of the points. Unresolved (NaN), zero and negative deviations are not drawn
    /// and are counted in the legend.
    /// </summary>
    /// <param name="series">One series per species.</param>
    /// <param name="width">Image width in pixels.</param>
    /// <param name="height">Image height in pixels.</param>
    /// <param name="sizeLabel">Horizontal axis label.</param>
    /// <param name="deviationLabel">Vertical axis label.</param>
    /// <returns>PNG bytes.</returns>
    public static byte[] SweepLogLog(IReadOnlyList<SweepSeries> series, int width = 900, int height = 500,
        string sizeLabel = "system size Ω", string deviationLabel = "relative deviation from rate equation") =>
        SweepFigure.Render(series, width, height, sizeLabel, deviationLabel).Png;
}
