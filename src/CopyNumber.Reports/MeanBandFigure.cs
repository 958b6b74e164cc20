using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// Mean of the ensemble with its 5–95 % band, against the rate equation and the linear noise
/// approximation's ±2σ band (van Kampen 2007, Stochastic Processes in Physics and Chemistry, 3rd ed.,
/// ch. X, quoted from memory). The two bands must never be confused: the ensemble band is a filled
/// area, the LNA band a pair of dashed outlines in the rate equation's colour.
/// </summary>
internal static class MeanBandFigure
{
    public static FigureImage Render(BandSeries s, int width, int height)
    {
        FigureLook.CheckSize(width, height);
        return FigureLook.Render(Build(s), width, height);
    }

    /// <summary>The plot, not yet rendered (tests read its layout after rendering it).</summary>
    internal static Plot Build(BandSeries s)
    {
        Check(s);
        var plot = FigureLook.NewPlot(s.Species, FigureLook.Labelled("time", s.TimeUnit), FigureLook.Labelled(s.Species, s.CountUnit));
        if (s.IsCount) FigureLook.CountAxis(plot.Axes.Left);
        double[] t = s.Time;
        bool drewAny = false;

        bool pathsLabelled = false;
        foreach (double[] path in s.SamplePaths)
        {
            string? label = pathsLabelled ? null : $"sample paths ({s.SamplePaths.Count})";
            pathsLabelled |= Lines(plot, t, path, Palette.SamplePath, 1f, LinePattern.Solid, ConnectStyle.StepHorizontal, label,
                MarkerShape.FilledCircle);
        }
        drewAny |= pathsLabelled;

        drewAny |= FilledBand(plot, t, s.Lower05, s.Upper95, Palette.EnsembleBand, "ensemble 5–95 %");

        if (s.LnaLower is not null && s.LnaUpper is not null)
        {
            bool lower = Lines(plot, t, s.LnaLower, Palette.RateEquation, 2f, LinePattern.Dashed, ConnectStyle.Straight, "LNA ±2σ",
                MarkerShape.HorizontalBar);
            drewAny |= lower;
            drewAny |= Lines(plot, t, s.LnaUpper, Palette.RateEquation, 2f, LinePattern.Dashed, ConnectStyle.Straight,
                lower ? null : "LNA ±2σ", MarkerShape.HorizontalBar);
        }

        drewAny |= Lines(plot, t, s.RateEquation, Palette.RateEquation, 2.5f, LinePattern.Solid, ConnectStyle.Straight, "rate equation",
            MarkerShape.FilledDiamond);
        drewAny |= Lines(plot, t, s.Mean, Palette.EnsembleMean, 3f, LinePattern.Solid, ConnectStyle.Straight, "ensemble mean",
            MarkerShape.FilledCircle);

        var finiteTimes = t.Where(double.IsFinite).ToArray();
        if (finiteTimes.Length > 0)
            FigureLook.TimeAxis(plot, plot.Axes.Bottom, s.TimeUnit, s.ScheduleChanges, finiteTimes.Min(), finiteTimes.Max());
        if (drewAny) FigureLook.LegendOutside(plot);
        else FigureLook.NoDataNote(plot, "no finite values to draw");
        return plot;
    }

    private static void Check(BandSeries s)
    {
        InputChecks.NotNull(s, "The band series");
        string owner = $"Band series '{s.Species}'";
        InputChecks.NotNull(s.Time, $"{owner}: Time");
        int n = s.Time.Length;
        InputChecks.Aligned(owner, nameof(s.Mean), s.Mean, n);
        InputChecks.Aligned(owner, nameof(s.Lower05), s.Lower05, n);
        InputChecks.Aligned(owner, nameof(s.Upper95), s.Upper95, n);
        InputChecks.Aligned(owner, nameof(s.RateEquation), s.RateEquation, n);
        if ((s.LnaLower is null) != (s.LnaUpper is null))
            throw new ReportException($"{owner}: give both LnaLower and LnaUpper, or neither.");
        if (s.LnaLower is not null) InputChecks.Aligned(owner, nameof(s.LnaLower), s.LnaLower, n);
        if (s.LnaUpper is not null) InputChecks.Aligned(owner, nameof(s.LnaUpper), s.LnaUpper, n);
        InputChecks.NotNull(s.SamplePaths, $"{owner}: SamplePaths");
        for (int i = 0; i < s.SamplePaths.Count; i++)
            InputChecks.Aligned(owner, $"sample path {i + 1}", s.SamplePaths[i], n);
    }

    /// <summary>
    /// Draws y(t) run by run; the first run carries <paramref name="label"/> in the legend. A run of one
    /// point becomes a marker of <paramref name="loneShape"/> so it stays visible and, where colours are
    /// shared (rate equation and LNA bounds), distinguishable. Returns whether anything was drawn.
    /// </summary>
    internal static bool Lines(Plot plot, double[] t, double[] y, Color color, float width, LinePattern pattern,
        ConnectStyle connect, string? label, MarkerShape loneShape)
    {
        var runs = FiniteRuns.Of(t.Length, i => FiniteRuns.Finite(t[i], y[i]));
        string? pendingLabel = label;
        foreach (var run in runs)
        {
            var line = plot.Add.Scatter(FiniteRuns.Slice(t, run), FiniteRuns.Slice(y, run), color);
            line.LineWidth = width;
            line.LinePattern = pattern;
            line.ConnectStyle = connect;
            line.MarkerShape = loneShape;
            line.MarkerSize = run.Count == 1 ? 3 * width + 6 : 0;
            line.MarkerLineWidth = width;
            if (pendingLabel is not null)
            {
                line.LegendText = pendingLabel;
                pendingLabel = null;
            }
        }
        return runs.Count > 0;
    }

    /// <summary>A filled band run by run; a run of one time point becomes a thick vertical bar.</summary>
    internal static bool FilledBand(Plot plot, double[] t, double[] lower, double[] upper, Color color, string? label)
    {
        var runs = FiniteRuns.Of(t.Length, i => FiniteRuns.Finite(t[i], lower[i], upper[i]));
        bool labelled = false;
        foreach (var run in runs)
        {
            if (run.Count == 1)
            {
                int i = run.Start;
                var bar = plot.Add.Line(t[i], lower[i], t[i], upper[i]);
                bar.LineWidth = 14;
                bar.LineColor = color;
                bar.MarkerSize = 0;
                if (!labelled && label is not null) bar.LegendText = label;
            }
            else
            {
                var band = plot.Add.FillY(FiniteRuns.Slice(t, run), FiniteRuns.Slice(lower, run), FiniteRuns.Slice(upper, run));
                band.FillColor = color;
                band.LineWidth = 0;
                band.MarkerSize = 0;
                if (!labelled && label is not null) band.LegendText = label;
            }
            labelled = true;
        }
        return runs.Count > 0;
    }
}
