using CopyNumber.Storage;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The scan's figures: for one varied name, each measure of every quantity against it (error band, threshold);
/// for two, a verdict map per quantity with the adequacy boundary and the rate equations' bistable region drawn
/// over it. A logarithmic axis is drawn in log10 of the value with decade ticks.
/// </summary>
internal static class ScanFigures
{
    /// <summary>One measure against the single varied name: a line per quantity, its error band when given, dashed threshold lines.</summary>
    public static FigureImage Curves(string title, string axis, bool log, string measure, IReadOnlyList<(string Quantity, double[] X, double[] Y, double[]? HalfWidth)> series,
        IReadOnlyList<double> thresholds, int width = 900, int height = 450) =>
        FigureLook.Render(BuildCurves(title, axis, log, measure, series, thresholds), width, height);

    /// <summary>The plot of <see cref="Curves"/>, not yet rendered.</summary>
    internal static Plot BuildCurves(string title, string axis, bool log, string measure, IReadOnlyList<(string Quantity, double[] X, double[] Y, double[]? HalfWidth)> series,
        IReadOnlyList<double> thresholds)
    {
        var plot = FigureLook.NewPlot(title, log ? axis + " (log scale)" : axis, measure);
        var drawn = 0;
        for (var k = 0; k < series.Count; k++)
        {
            var (quantity, xs, ys, half) = series[k];
            var colour = Palette.Series[k % Palette.Series.Length];
            var keep = Enumerable.Range(0, xs.Length).Where(i => double.IsFinite(ys[i]) && (!log || xs[i] > 0)).ToArray();
            if (keep.Length == 0) continue;
            var x = keep.Select(i => log ? Math.Log10(xs[i]) : xs[i]).ToArray();
            var y = keep.Select(i => ys[i]).ToArray();
            if (half is not null)
            {
                var hw = keep.Select(i => double.IsFinite(half[i]) ? half[i] : 0).ToArray();
                var band = plot.Add.FillY(x, y.Select((v, i) => v - hw[i]).ToArray(), y.Select((v, i) => v + hw[i]).ToArray());
                band.FillColor = colour.WithAlpha(0.2);
                band.LineWidth = 0;
            }
            var line = plot.Add.Scatter(x, y, colour);
            line.LineWidth = 1.5f;
            line.MarkerShape = Palette.SeriesMarkers[k % Palette.SeriesMarkers.Length];
            line.MarkerSize = 8;
            line.LegendText = quantity;
            drawn++;
        }
        for (var i = 0; i < thresholds.Count; i++)
        {
            var h = plot.Add.HorizontalLine(thresholds[i], 2, Palette.Threshold, LinePattern.Dotted);
            if (i == 0) h.LegendText = thresholds.Count == 1 ? "threshold" : "thresholds";
        }
        if (drawn == 0) FigureLook.NoDataNote(plot, "no point has a value of this measure");
        var allX = series.SelectMany(q => q.X).Where(v => v > 0).ToArray();
        if (log && allX.Length > 0) plot.Axes.Bottom.TickGenerator = LogTicks.For(Math.Log10(allX.Min()), Math.Log10(allX.Max()));
        FigureLook.LegendOutside(plot);
        return plot;
    }

    /// <summary>
    /// The verdict map of one quantity over two varied names. Each point is a square coloured by its verdict
    /// (<see cref="VerdictColours"/>) and lettered; on a full grid the cell edges between an adequate and a
    /// non-adequate point are drawn as the adequacy boundary (solid), and those around the points with two or
    /// more stable steady states of the rate equations as the bistable region (dashed).
    /// </summary>
    public static FigureImage VerdictMap(string quantity, (string Name, bool Log) xAxis, (string Name, bool Log) yAxis, IReadOnlyList<ScanCell> cells, bool isGrid,
        int width = 1150, int height = 700)
    {
        var plot = FigureLook.NewPlot($"verdicts for {quantity}", xAxis.Log ? xAxis.Name + " (log scale)" : xAxis.Name, yAxis.Log ? yAxis.Name + " (log scale)" : yAxis.Name);
        double X(ScanCell c) => xAxis.Log ? Math.Log10(c.Values[0]) : c.Values[0];
        double Y(ScanCell c) => yAxis.Log ? Math.Log10(c.Values[1]) : c.Values[1];
        var xs = cells.Select(X).Distinct().Order().ToArray();
        var ys = cells.Select(Y).Distinct().Order().ToArray();
        // On a grid a cell fills the space to its neighbours; scattered points (a Latin hypercube) get squares of
        // half the spacing of a √N × √N grid over the same ranges.
        var side = Math.Max(3, Math.Sqrt(cells.Count));
        var dx = isGrid ? Spacing(xs) : Math.Max(xs[^1] - xs[0], 1e-9) / side / 2;
        var dy = isGrid ? Spacing(ys) : Math.Max(ys[^1] - ys[0], 1e-9) / side / 2;
        var used = new HashSet<string>();
        foreach (var c in cells)
        {
            var (column, letter, label, colour) = Category(c);
            var rectangle = plot.Add.Rectangle(X(c) - dx / 2, X(c) + dx / 2, Y(c) - dy / 2, Y(c) + dy / 2);
            rectangle.FillColor = colour;
            rectangle.LineColor = Colors.White;
            rectangle.LineWidth = 1;
            if (used.Add(column)) rectangle.LegendText = $"{letter}: {label}";
            if (!isGrid && c.StableSteadyStates >= 2)
            {
                // Scattered points have no neighbours to draw a region's edge between: each bistable point is outlined.
                rectangle.LineColor = VerdictColours.Bistable;
                rectangle.LinePattern = LinePattern.Dashed;
                rectangle.LineWidth = 2.5f;
            }
            var text = plot.Add.Text(letter, X(c), Y(c));
            text.LabelFontSize = 13;
            text.LabelFontColor = column is "adequate" or "noise_dominated" or "too_few_replicates" ? Palette.Ink : Colors.White;
            text.LabelAlignment = Alignment.MiddleCenter;
        }
        if (isGrid)
        {
            Edges(plot, cells, X, Y, dx, dy, c => c.Flags[0] == 1, VerdictColours.Boundary, LinePattern.Solid, 3.5f, "adequacy boundary");
            Edges(plot, cells, X, Y, dx, dy, c => c.StableSteadyStates >= 2, VerdictColours.Bistable, LinePattern.Dashed, 2.5f, "rate equations bistable (dashed)");
        }
        if (xAxis.Log) plot.Axes.Bottom.TickGenerator = LogTicks.For(xs[0] - dx / 2, xs[^1] + dx / 2);
        if (yAxis.Log) plot.Axes.Left.TickGenerator = LogTicks.For(ys[0] - dy / 2, ys[^1] + dy / 2);
        FigureLook.LegendOutside(plot);
        return FigureLook.Render(plot, width, height);
    }

    private static (string Column, string Letter, string Label, Color Colour) Category(ScanCell c)
    {
        foreach (var category in VerdictColours.Categories)
            if (c.Flags[ScanTable.VerdictColumns.ToList().IndexOf(category.Column)] == 1) return category;
        return VerdictColours.Categories[^1];
    }

    private static double Spacing(double[] values)
    {
        if (values.Length < 2) return 1;
        return Enumerable.Range(1, values.Length - 1).Select(i => values[i] - values[i - 1]).Min();
    }

    /// <summary>Draws the grid-cell edges between neighbours that differ in <paramref name="inside"/>; a region reaching the map's border is left open there.</summary>
    private static void Edges(Plot plot, IReadOnlyList<ScanCell> cells, Func<ScanCell, double> x, Func<ScanCell, double> y, double dx, double dy,
        Func<ScanCell, bool> inside, Color colour, LinePattern pattern, float width, string label)
    {
        var at = new Dictionary<(long, long), bool>();
        var x0 = cells.Min(x);
        var y0 = cells.Min(y);
        (long, long) Key(ScanCell c) => ((long)Math.Round((x(c) - x0) / dx), (long)Math.Round((y(c) - y0) / dy));
        foreach (var group in cells.GroupBy(Key)) at[group.Key] = group.All(inside);
        var first = true;
        foreach (var ((i, j), here) in at)
        {
            foreach (var (di, dj) in new[] { (1L, 0L), (0L, 1L) })
            {
                if (!at.TryGetValue((i + di, j + dj), out var there) || there == here) continue;
                var cx = x0 + (i + di / 2.0) * dx;
                var cy = y0 + (j + dj / 2.0) * dy;
                var line = di == 1 ? plot.Add.Line(cx, cy - dy / 2, cx, cy + dy / 2) : plot.Add.Line(cx - dx / 2, cy, cx + dx / 2, cy);
                line.LineColor = colour;
                line.LinePattern = pattern;
                line.LineWidth = width;
                if (first) line.LegendText = label;
                first = false;
            }
        }
    }
}
