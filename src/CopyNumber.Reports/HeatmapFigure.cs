using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// Probability of each copy number over time as a colour map. The colour map is viridis, which is
/// perceptually uniform and ordered in lightness, so it reads correctly in grey and under colour-vision
/// deficiency (Smith &amp; van der Walt 2015, "A better default colormap for Matplotlib", SciPy 2015;
/// Nuñez, Anderton &amp; Renslow 2018, PLoS ONE 13:e0199239; both quoted from memory).
/// The colour is scaled per time: each column is divided by its own largest probability, so the most likely count
/// at every time takes the top colour and a second mode shows as a second ridge. A single scale for the whole map
/// is set by its largest cell, usually the point mass at t = 0, which leaves every later time near-black (issue 16).
/// The colour bar says so; the absolute probabilities are in distributions.parquet.
/// </summary>
internal static class HeatmapFigure
{
    /// <summary>An uneven time grid is resampled onto at most this many equal columns.</summary>
    private const int MaxColumns = 2000;

    /// <summary>The colour bar's label: which scale the colours are on.</summary>
    internal const string PerTimeScaleLabel = "probability ÷ largest at that time";

    public static FigureImage Render(DistributionHeatmap h, int width, int height)
    {
        FigureLook.CheckSize(width, height);
        return FigureLook.Render(Build(h), width, height);
    }

    /// <summary>The plot, not yet rendered.</summary>
    internal static Plot Build(DistributionHeatmap h)
    {
        Check(h);
        var plot = FigureLook.NewPlot(h.Species, FigureLook.Labelled("time", h.TimeUnit), FigureLook.Labelled(h.Species, h.CountUnit));

        FigureLook.CountAxis(plot.Axes.Left);
        // Times that are NaN are skipped like any other missing value.
        int[] usable = Enumerable.Range(0, h.Time.Length).Where(i => double.IsFinite(h.Time[i])).ToArray();
        var (columnOf, left, right) = Columns(usable.Select(i => h.Time[i]).ToArray());
        int counts = (int)(h.MaxCount - h.MinCount + 1);
        // ScottPlot draws row 0 at the top; the map is built with the largest count in row 0.
        var cells = new double[counts, columnOf.Length];
        bool anyFinite = false;
        for (int c = 0; c < columnOf.Length; c++)
        {
            int row = usable[columnOf[c]];
            double highest = 0;
            for (int k = 0; k < counts; k++)
                if (double.IsFinite(h.Probability[row, k])) highest = Math.Max(highest, h.Probability[row, k]);
            for (int k = 0; k < counts; k++)
            {
                double p = h.Probability[row, k];
                // A time with no probability anywhere stays at 0 rather than 0/0.
                cells[counts - 1 - k, c] = double.IsFinite(p) && highest > 0 ? p / highest : p;
                anyFinite |= double.IsFinite(p);
            }
        }

        if (anyFinite)
        {
            var map = plot.Add.Heatmap(AtLeastTwoByTwo(cells));
            map.Colormap = new ScottPlot.Colormaps.Viridis();
            map.NaNCellColor = Colors.Transparent;
            map.ManualRange = new ScottPlot.Range(0, 1);
            map.Extent = new CoordinateRect(left, right, h.MinCount - 0.5, h.MaxCount + 0.5);
            var bar = plot.Add.ColorBar(map);
            bar.Label = PerTimeScaleLabel;
            bar.LabelStyle.FontSize = FigureLook.AxisLabelSize;
            bar.LabelStyle.Bold = false;
            bar.Axis.TickLabelStyle.FontSize = FigureLook.TickLabelSize;
        }

        bool drewRateEquation = h.RateEquation is not null && MeanBandFigure.Lines(plot, h.Time, h.RateEquation,
            Palette.RateEquation, 2.5f, LinePattern.Solid, ConnectStyle.Straight, "rate equation", MarkerShape.FilledDiamond);
        FigureLook.TimeAxis(plot, plot.Axes.Bottom, h.TimeUnit, h.ScheduleChanges, left, right);
        if (drewRateEquation || h.ScheduleChanges.Count > 0) FigureLook.LegendOutside(plot);
        if (!anyFinite && !drewRateEquation) FigureLook.NoDataNote(plot, "no finite probabilities to draw");
        if (anyFinite) plot.Axes.SetLimits(left, right, h.MinCount - 0.5, h.MaxCount + 0.5);
        return plot;
    }

    private static void Check(DistributionHeatmap h)
    {
        InputChecks.NotNull(h, "The distribution heat map");
        string owner = $"Heat map of '{h.Species}'";
        InputChecks.NotNull(h.Time, $"{owner}: Time");
        InputChecks.NotNull(h.Probability, $"{owner}: Probability");
        if (h.MaxCount < h.MinCount)
            throw new ReportException($"{owner}: MaxCount ({h.MaxCount}) is below MinCount ({h.MinCount}).");
        if (h.MaxCount - h.MinCount >= 1_000_000)
            throw new ReportException($"{owner}: {h.MaxCount - h.MinCount + 1} copy numbers is too many rows for a heat map (at most 1,000,000).");
        long counts = h.MaxCount - h.MinCount + 1;
        if (h.Probability.GetLength(0) != h.Time.Length || h.Probability.GetLength(1) != counts)
            throw new ReportException(
                $"{owner}: Probability is {h.Probability.GetLength(0)} × {h.Probability.GetLength(1)} but must be " +
                $"{h.Time.Length} (times) × {counts} (copy numbers {h.MinCount}..{h.MaxCount}).");
        if (h.RateEquation is not null) InputChecks.Aligned(owner, nameof(h.RateEquation), h.RateEquation, h.Time.Length);
        double previous = double.NegativeInfinity;
        for (int i = 0; i < h.Time.Length; i++)
        {
            if (!double.IsFinite(h.Time[i])) continue;
            if (h.Time[i] <= previous)
                throw new ReportException($"{owner}: Time must increase; entry {i + 1} ({h.Time[i]}) is not above the one before it.");
            previous = h.Time[i];
        }
    }

    /// <summary>
    /// Equal-width columns covering the time grid: each time owns the interval between the midpoints to
    /// its neighbours, and each column takes the time whose interval holds the column's centre. An even
    /// grid maps one column to one time. Returns the time index of each column and the horizontal extent.
    /// </summary>
    internal static (int[] ColumnOf, double Left, double Right) Columns(double[] time)
    {
        int n = time.Length;
        if (n == 0) return ([], 0, 1);
        if (n == 1) return ([0], time[0] - 0.5, time[0] + 0.5);

        var edges = new double[n + 1];
        edges[0] = time[0] - (time[1] - time[0]) / 2;
        edges[n] = time[n - 1] + (time[n - 1] - time[n - 2]) / 2;
        for (int i = 1; i < n; i++) edges[i] = (time[i - 1] + time[i]) / 2;

        double smallest = double.PositiveInfinity;
        for (int i = 0; i < n; i++) smallest = Math.Min(smallest, edges[i + 1] - edges[i]);
        double span = edges[n] - edges[0];
        int columns = (int)Math.Min(MaxColumns, Math.Max(n, Math.Round(span / smallest)));
        if (IsEven(time)) columns = n;

        var columnOf = new int[columns];
        for (int c = 0; c < columns; c++)
        {
            double centre = edges[0] + (c + 0.5) * span / columns;
            int at = Array.BinarySearch(edges, centre);
            int owner = at >= 0 ? at : ~at - 1;
            columnOf[c] = Math.Clamp(owner, 0, n - 1);
        }
        return (columnOf, edges[0], edges[n]);
    }

    /// <summary>
    /// ScottPlot 5.1 draws nothing for a heat map one cell wide or high (seen in this environment), so a
    /// single row or column is doubled; over the same extent the picture is unchanged.
    /// </summary>
    internal static double[,] AtLeastTwoByTwo(double[,] cells)
    {
        int rows = cells.GetLength(0), columns = cells.GetLength(1);
        int rowRepeat = rows < 2 ? 2 : 1, columnRepeat = columns < 2 ? 2 : 1;
        if (rowRepeat == 1 && columnRepeat == 1) return cells;
        var wider = new double[rows * rowRepeat, columns * columnRepeat];
        for (int r = 0; r < wider.GetLength(0); r++)
            for (int c = 0; c < wider.GetLength(1); c++)
                wider[r, c] = cells[r / rowRepeat, c / columnRepeat];
        return wider;
    }

    private static bool IsEven(double[] time)
    {
        double step = (time[^1] - time[0]) / (time.Length - 1);
        for (int i = 1; i < time.Length; i++)
            if (Math.Abs(time[i] - time[i - 1] - step) > 1e-9 * Math.Max(Math.Abs(step), 1e-300)) return false;
        return true;
    }
}
