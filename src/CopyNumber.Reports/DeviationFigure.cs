using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The relative deviation of the ensemble mean from the rate equations over time, (mean − RE) / |RE|, with its confidence
/// band (± z standard errors of the mean, relative) and the verdict's threshold at ± the allowed fraction. Every number is
/// the contrast's own (<see cref="Analysis.MeanDeviation"/>); nothing is estimated here. Times where the rate equations lie
/// below the deterministic floor have no relative deviation and leave a gap.
/// </summary>
internal static class DeviationFigure
{
    /// <param name="quantity">Species or readout name (title).</param>
    /// <param name="time">Grid times, model time units.</param>
    /// <param name="relative">Relative deviation per time; NaN where undefined.</param>
    /// <param name="halfWidth">Relative confidence half-width per time (z·SE / |RE|).</param>
    /// <param name="threshold">The verdict's relative threshold (a fraction, e.g. 0.1), drawn at ±threshold.</param>
    /// <param name="z">Standard errors in the half-width, for the legend.</param>
    /// <param name="timeUnit">The model's time unit, or "time".</param>
    /// <param name="scheduleChanges">Times of the schedule's changes, marked on the time axis.</param>
    internal static Plot Build(string quantity, double[] time, double[] relative, double[] halfWidth, double threshold, double z,
        string timeUnit, IReadOnlyList<double> scheduleChanges)
    {
        InputChecks.Aligned($"Deviation of '{quantity}'", nameof(relative), relative, time.Length);
        InputChecks.Aligned($"Deviation of '{quantity}'", nameof(halfWidth), halfWidth, time.Length);
        var plot = FigureLook.NewPlot($"{quantity}: mean against the rate equations", "time", "(mean − rate equations) / rate equations");
        var lower = relative.Select((d, i) => d - halfWidth[i]).ToArray();
        var upper = relative.Select((d, i) => d + halfWidth[i]).ToArray();
        Band(plot, time, lower, upper, $"±{z.ToString("0.##", System.Globalization.CultureInfo.InvariantCulture)} standard errors");
        bool drew = MeanBandFigure.Lines(plot, time, relative, Palette.EnsembleMean, 2.5f, LinePattern.Solid, ConnectStyle.Straight,
            "relative deviation", MarkerShape.FilledCircle);
        plot.Add.HorizontalLine(0, 1, Palette.Note, LinePattern.Solid);
        if (threshold > 0 && double.IsFinite(threshold))
        {
            var above = plot.Add.HorizontalLine(threshold, 2, Palette.Threshold, LinePattern.Dotted);
            above.LegendText = $"threshold ±{(threshold * 100).ToString("0.##", System.Globalization.CultureInfo.InvariantCulture)} %";
            plot.Add.HorizontalLine(-threshold, 2, Palette.Threshold, LinePattern.Dotted);
        }
        var finite = time.Where(double.IsFinite).ToArray();
        if (finite.Length > 0) FigureLook.TimeAxis(plot, plot.Axes.Bottom, timeUnit, scheduleChanges, finite.Min(), finite.Max());
        if (!drew) FigureLook.NoDataNote(plot, "no relative deviation: the rate equations stay below the floor");
        FigureLook.LegendOutside(plot);
        return plot;
    }

    /// <summary>The confidence band as one filled area per run of finite values, the first named in the legend.</summary>
    private static void Band(Plot plot, double[] t, double[] lower, double[] upper, string label)
    {
        var runs = FiniteRuns.Of(t.Length, i => FiniteRuns.Finite(t[i], lower[i], upper[i]));
        string? pending = label;
        foreach (var run in runs.Where(r => r.Count > 1))
        {
            var fill = plot.Add.FillY(FiniteRuns.Slice(t, run), FiniteRuns.Slice(lower, run), FiniteRuns.Slice(upper, run));
            fill.FillColor = Palette.EnsembleBand;
            fill.LineWidth = 0;
            fill.MarkerSize = 0;
            if (pending is not null) fill.LegendText = pending;
            pending = null;
        }
    }
}
