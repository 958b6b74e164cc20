using System.Globalization;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// Copy-number distributions at chosen times, one panel per time, all panels on the same axes so that
/// they compare at a glance; the rate-equation value is a vertical line in each panel.
/// </summary>
internal static class HistogramFigure
{
    public static FigureImage Render(IReadOnlyList<HistogramSnapshot> snapshots, int width, int height)
    {
        FigureLook.CheckSize(width, height);
        var (panels, columns) = Build(snapshots, width, height);
        return FigureLook.Render(panels, columns, width, height);
    }

    /// <summary>The panels, not yet rendered, and how many go to a row.</summary>
    internal static (List<Plot> Panels, int Columns) Build(IReadOnlyList<HistogramSnapshot> snapshots, int width, int height)
    {
        InputChecks.NotNull(snapshots, "The list of histogram snapshots");
        foreach (var snap in snapshots) Check(snap);

        if (snapshots.Count == 0)
        {
            var empty = FigureLook.NewPlot("copy-number distribution", "copy number (copies)", "probability");
            FigureLook.NoDataNote(empty, "no snapshots to draw");
            return ([empty], 1);
        }

        var (columns, scale) = FigureLook.PanelGrid(snapshots.Count, width, height);
        var limits = SharedLimits(snapshots);

        var panels = new List<Plot>(snapshots.Count);
        for (int k = 0; k < snapshots.Count; k++)
            panels.Add(Panel(snapshots[k], limits, scale));
        return (panels, columns);
    }

    private static void Check(HistogramSnapshot snap)
    {
        InputChecks.NotNull(snap, "A histogram snapshot");
        string owner = $"Histogram of '{snap.Species}' at time {snap.Time.ToString("G6", CultureInfo.InvariantCulture)}";
        InputChecks.NotNull(snap.Counts, $"{owner}: Counts");
        InputChecks.Aligned(owner, nameof(snap.Probabilities), snap.Probabilities, snap.Counts.Length, nameof(snap.Counts));
    }

    private static Plot Panel(HistogramSnapshot snap, AxisLimits? limits, float scale)
    {
        string time = snap.Time.ToString("G4", CultureInfo.InvariantCulture);
        string unit = string.IsNullOrWhiteSpace(snap.TimeUnit) || snap.TimeUnit == "time" ? "" : " " + snap.TimeUnit;
        var plot = FigureLook.NewPlot($"{snap.Species} at t = {time}{unit}",
            FigureLook.Labelled(snap.Species, snap.CountUnit), "probability", scale);

        if (snap.IsCount) FigureLook.CountAxis(plot.Axes.Bottom);
        var bars = new List<Bar>();
        double barWidth = 0.8 * Math.Min(1.0, SmallestGap(snap.Counts));
        for (int i = 0; i < snap.Counts.Length; i++)
        {
            double p = snap.Probabilities[i];
            if (!double.IsFinite(p)) continue;
            bars.Add(new Bar
            {
                Position = snap.Counts[i], Value = p, Size = barWidth,
                FillColor = Palette.SkyBlue, LineColor = Palette.Blue, LineWidth = 1,
            });
        }
        if (bars.Count > 0)
        {
            var plottable = plot.Add.Bars(bars);
            plottable.LegendText = "probability";
        }
        if (double.IsFinite(snap.RateEquationValue))
        {
            var line = plot.Add.VerticalLine(snap.RateEquationValue, 3, Palette.RateEquation, LinePattern.Solid);
            line.LegendText = "rate equation";
        }

        if (bars.Count == 0 && !double.IsFinite(snap.RateEquationValue))
            FigureLook.NoDataNote(plot, "no finite values to draw", scale);
        else
            // Below each panel rather than beside it: panels share their axes, so every panel keeps the same data area.
            FigureLook.LegendOutside(plot, Edge.Bottom);
        if (limits is { } l) plot.Axes.SetLimits(l);
        return plot;
    }

    /// <summary>Smallest spacing between distinct counts, so bars of sparse histograms do not overlap.</summary>
    private static double SmallestGap(long[] counts)
    {
        var sorted = counts.Distinct().Order().ToArray();
        double gap = 1.0;
        for (int i = 1; i < sorted.Length; i++) gap = Math.Min(gap, sorted[i] - sorted[i - 1]);
        return gap;
    }

    /// <summary>One set of limits for every panel: all finite counts with probability, and the rate-equation lines.</summary>
    private static AxisLimits? SharedLimits(IReadOnlyList<HistogramSnapshot> snapshots)
    {
        double xMin = double.PositiveInfinity, xMax = double.NegativeInfinity, yMin = 0, yMax = 0;
        foreach (var snap in snapshots)
        {
            for (int i = 0; i < snap.Counts.Length; i++)
            {
                if (!double.IsFinite(snap.Probabilities[i])) continue;
                xMin = Math.Min(xMin, snap.Counts[i]);
                xMax = Math.Max(xMax, snap.Counts[i]);
                yMin = Math.Min(yMin, snap.Probabilities[i]);
                yMax = Math.Max(yMax, snap.Probabilities[i]);
            }
            if (double.IsFinite(snap.RateEquationValue))
            {
                xMin = Math.Min(xMin, snap.RateEquationValue);
                xMax = Math.Max(xMax, snap.RateEquationValue);
            }
        }
        if (!double.IsFinite(xMin)) return null;
        double pad = Math.Max(1.0, 0.04 * (xMax - xMin));
        double top = yMax > 0 ? 1.05 * yMax : 1.0;
        return new AxisLimits(xMin - pad, xMax + pad, yMin, top);
    }
}
