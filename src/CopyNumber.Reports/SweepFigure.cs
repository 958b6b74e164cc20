using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// Deviation of the ensemble mean from the rate equation against system size, both axes logarithmic,
/// with a slope −1 reference line: the deviation of the mean from the macroscopic value is O(1/Ω) for
/// mass-action kinetics (van Kampen 2007, Stochastic Processes in Physics and Chemistry, ch. X; Grima
/// 2010, J. Chem. Phys. 133:035101; quoted from memory). The data are log10-transformed before plotting
/// and the axes carry decade ticks, so points that cannot sit on a log axis (NaN, zero, negative) are left
/// out and counted in the legend.
/// </summary>
internal static class SweepFigure
{
    private const double Padding = 0.12; // decades of margin around the data

    public static FigureImage Render(IReadOnlyList<SweepSeries> series, int width, int height, string sizeLabel, string deviationLabel,
        double threshold = double.NaN)
    {
        FigureLook.CheckSize(width, height);
        return FigureLook.Render(Build(series, sizeLabel, deviationLabel, threshold), width, height);
    }

    /// <summary>
    /// The plot, not yet rendered; <paramref name="threshold"/> (a relative deviation, e.g. 0.1) is drawn as a dashed
    /// horizontal line, the verdict's threshold, when it is positive.
    /// </summary>
    internal static Plot Build(IReadOnlyList<SweepSeries> series, string sizeLabel, string deviationLabel, double threshold)
    {
        InputChecks.NotNull(series, "The list of sweep series");
        foreach (var s in series) Check(s);

        var plot = FigureLook.NewPlot("deviation from the rate equation", sizeLabel, deviationLabel);
        // Faint lines at 2…9 × 10ⁿ are what make a log axis readable between decades.
        plot.Grid.MinorLineColor = Palette.Grid.WithAlpha(0.6);
        plot.Grid.MinorLineWidth = 1;
        var xs = new List<double>();
        var ys = new List<double>();      // log deviations of drawn points, aligned with xs
        var barEnds = new List<double>(); // finite log ends of error bars, for the axis range only
        var notDrawn = new List<string>();
        var bars = new List<(double X, double Lower, double Upper, Color Color)>();

        for (int k = 0; k < series.Count; k++)
        {
            var s = series[k];
            Color color = Palette.Series[k % Palette.Series.Length];
            MarkerShape shape = Palette.SeriesMarkers[k % Palette.SeriesMarkers.Length];
            int n = s.Sizes.Length;
            double[] logSize = s.Sizes.Select(LogOrNaN).ToArray();
            double[] logDev = s.RelativeDeviation.Select(LogOrNaN).ToArray();
            int unresolved = s.RelativeDeviation.Count(double.IsNaN);
            int offScale = Enumerable.Range(0, n).Count(i => !FiniteRuns.Finite(logSize[i], logDev[i])) - unresolved;

            var runs = FiniteRuns.Of(n, i => FiniteRuns.Finite(logSize[i], logDev[i]));
            if (runs.Count == 0)
            {
                notDrawn.Add(s.Species);
                continue;
            }
            string label = s.Species + Omitted(unresolved, offScale);
            foreach (var run in runs)
            {
                var line = plot.Add.Scatter(FiniteRuns.Slice(logSize, run), FiniteRuns.Slice(logDev, run), color);
                line.LineWidth = 1.5f;
                line.MarkerShape = shape;
                line.MarkerSize = 10;
                if (run.Start == runs[0].Start) line.LegendText = label;
            }
            for (int i = 0; i < n; i++)
            {
                if (!FiniteRuns.Finite(logSize[i], logDev[i])) continue;
                xs.Add(logSize[i]);
                ys.Add(logDev[i]);
                double se = s.DeviationStdError[i];
                if (!(se > 0) || !double.IsFinite(se)) continue;
                double upper = Math.Log10(s.RelativeDeviation[i] + se);
                double lowerValue = s.RelativeDeviation[i] - se;
                double lower = lowerValue > 0 ? Math.Log10(lowerValue) : double.NegativeInfinity;
                bars.Add((logSize[i], lower, upper, color));
                barEnds.Add(upper);
                if (double.IsFinite(lower)) barEnds.Add(lower);
            }
        }

        var (xLow, xHigh) = Range(xs, 0, 3);
        bool drawThreshold = threshold > 0 && double.IsFinite(threshold);
        double logThreshold = drawThreshold ? Math.Log10(threshold) : double.NaN;
        var (yLow, yHigh) = Range(drawThreshold ? [.. ys, .. barEnds, logThreshold] : [.. ys, .. barEnds], -3, 0);
        if (xs.Count > 0)
        {
            // Slope −1 through the centroid of all points: log d = b − log Ω.
            double b = 0;
            for (int i = 0; i < xs.Count; i++) b += ys[i] + xs[i];
            b /= xs.Count;
            double from = xLow + Padding, to = xHigh - Padding;
            if (to <= from) (from, to) = (xLow, xHigh);
            var reference = plot.Add.Line(from, b - from, to, b - to);
            reference.LineColor = Palette.Black;
            reference.LineWidth = 2;
            reference.LinePattern = LinePattern.Dashed;
            reference.MarkerSize = 0;
            reference.LegendText = "∝ 1/Ω (slope −1)";
            yLow = Math.Min(yLow, b - to);
            yHigh = Math.Max(yHigh, b - from);
        }
        // A bar whose lower end is at or below zero (value − SE ≤ 0) runs to the bottom of the axis.
        foreach (var (x, lower, upper, color) in bars)
        {
            var bar = plot.Add.Line(x, Math.Max(lower, yLow), x, upper);
            bar.LineColor = color;
            bar.LineWidth = 1.5f;
            bar.MarkerSize = 0;
        }

        if (drawThreshold)
        {
            var line = plot.Add.HorizontalLine(logThreshold, 2, Palette.Threshold, LinePattern.Dotted);
            line.LegendText = $"threshold {VerdictPercent(threshold)}";
        }

        plot.Axes.SetLimits(xLow, xHigh, yLow, yHigh);
        plot.Axes.Bottom.TickGenerator = LogTicks.For(xLow, xHigh);
        plot.Axes.Left.TickGenerator = LogTicks.For(yLow, yHigh);

        if (xs.Count == 0) FigureLook.NoDataNote(plot, "no resolved positive deviations to draw");
        else FigureLook.LegendOutside(plot);
        if (notDrawn.Count > 0 && xs.Count > 0)
            FigureLook.NoDataNote(plot, "nothing to draw for " + string.Join(", ", notDrawn), alignment: Alignment.LowerLeft);
        return plot;
    }

    private static void Check(SweepSeries s)
    {
        InputChecks.NotNull(s, "A sweep series");
        string owner = $"Sweep series '{s.Species}'";
        InputChecks.NotNull(s.Sizes, $"{owner}: Sizes");
        InputChecks.Aligned(owner, nameof(s.RelativeDeviation), s.RelativeDeviation, s.Sizes.Length, nameof(s.Sizes));
        InputChecks.Aligned(owner, nameof(s.DeviationStdError), s.DeviationStdError, s.Sizes.Length, nameof(s.Sizes));
    }

    private static string VerdictPercent(double fraction) =>
        (fraction * 100).ToString("0.##", System.Globalization.CultureInfo.InvariantCulture) + " %";

    private static double LogOrNaN(double v) => v > 0 && double.IsFinite(v) ? Math.Log10(v) : double.NaN;

    private static string Omitted(int unresolved, int offScale)
    {
        var parts = new List<string>();
        if (unresolved > 0) parts.Add($"{unresolved} unresolved");
        if (offScale > 0) parts.Add($"{offScale} off the log scale");
        return parts.Count == 0 ? "" : $" ({string.Join(", ", parts)}, not drawn)";
    }

    /// <summary>Padded range of log values, or the fallback decades when there are none.</summary>
    private static (double Low, double High) Range(IReadOnlyList<double> values, double fallbackLow, double fallbackHigh)
    {
        if (values.Count == 0) return (fallbackLow, fallbackHigh);
        double low = values.Min(), high = values.Max();
        if (high - low < 1) // less than a decade: widen symmetrically so the axis still reads as logarithmic
        {
            double mid = (low + high) / 2;
            (low, high) = (mid - 0.5, mid + 0.5);
        }
        return (low - Padding, high + Padding);
    }
}
