using System.Globalization;
using CopyNumber.Storage;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The report's answer to "how much of the noise is the cell's own?": when parameters vary from cell to
/// cell, each quantity's squared coefficient of variation split by the law of total variance into the
/// within-cell (intrinsic) and between-cell (extrinsic) parts (Swain, Elowitz &amp; Siggia 2002, PNAS
/// 99:12795), from <c>noise.parquet</c>. The split is estimated in the engine (Ensembles/NoiseDecomposition);
/// this section only shows it.
/// </summary>
internal static class NoiseSection
{
    private const int MaxPanels = 6;

    /// <summary>The section, or null when the run has no split (no parameter varies per cell).</summary>
    public static ReportSection? For(RunFolder run, string timeUnit, IReadOnlyList<double> scheduleChanges)
    {
        if (run.Noise.Count == 0) return null;
        var times = run.Times;
        var shown = new[] { times.Length / 2, times.Length - 1 }.Distinct().ToArray();
        var rows = new List<IReadOnlyList<string>>();
        foreach (var split in run.Noise)
            foreach (var k in shown)
            {
                var mean = split.Mean[k];
                var square = mean * mean;
                var intrinsic = split.IntrinsicVariance[k];
                var extrinsic = split.ExtrinsicVariance[k];
                var total = intrinsic + extrinsic;
                rows.Add([
                    split.Quantity, Format(times[k]), Format(mean),
                    Format(total / square),
                    $"{Format(intrinsic / square)} ± {Format(split.IntrinsicStandardError[k] / square)}",
                    $"{Format(extrinsic / square)} ± {Format(split.ExtrinsicStandardError[k] / square)}",
                    total > 0 ? Percent(extrinsic / total) : "-",
                ]);
            }
        var perDraw = run.Noise[0].ReplicatesPerDraw;
        var paragraphs = new[]
        {
            $"Some parameters vary from cell to cell; each cell's parameter draw was simulated {perDraw} times. "
            + "By the law of total variance each quantity's variance is the mean variance within a cell (intrinsic noise) plus the variance of the cell means "
            + "(extrinsic noise; Swain, Elowitz & Siggia 2002). Both are shown as squared coefficients of variation (variance over squared mean), "
            + "which add up to the total; ± is one standard error. noise.parquet holds the split at every grid time.",
        };
        var table = new ReportTable(
            ["quantity", $"time ({timeUnit})", "mean", "CV² total", "CV² intrinsic", "CV² extrinsic", "extrinsic share of variance"], rows);
        // A quantity that never varies (a conserved gene count) has nothing to split and gets no panel.
        var drawn = run.Noise.Where(split => split.IntrinsicVariance.Zip(split.ExtrinsicVariance).Any(p => p.First != 0 || p.Second != 0)).ToList();
        if (drawn.Count == 0) return new ReportSection("Noise: intrinsic and extrinsic", paragraphs, [table], []);
        var panels = drawn.Take(MaxPanels).Select(split => Panel(split, times, timeUnit, scheduleChanges, drawn.Count > 1 ? 0.8f : 1f)).ToList();
        var columns = panels.Count == 1 ? 1 : 2;
        var height = 420 * ((panels.Count + columns - 1) / columns);
        var caption = "Intrinsic and extrinsic squared coefficients of variation over time; the shaded bands are ±2 standard errors"
            + (drawn.Count > MaxPanels ? $" (the first {MaxPanels} of {drawn.Count} quantities that vary; noise.parquet holds all)." : ".");
        var figure = new ReportFigure("noise-split.png", caption, FigureLook.Render(panels, columns, 900, Math.Max(FigureLook.MinPixels, height)));
        return new ReportSection("Noise: intrinsic and extrinsic", paragraphs, [table], [figure]);
    }

    private static Plot Panel(StoredNoiseSplit split, double[] times, string timeUnit, IReadOnlyList<double> scheduleChanges, float scale)
    {
        var plot = FigureLook.NewPlot($"{split.Quantity}: where the noise comes from", "time", "CV² (variance / mean²)", scale);
        FigureLook.TimeAxis(plot, plot.Axes.Bottom, timeUnit == "time" ? null : timeUnit, scheduleChanges, times[0], times[^1]);
        Part(plot, times, split.Mean, split.IntrinsicVariance, split.IntrinsicStandardError, Palette.Series[0], "intrinsic (within a cell)");
        Part(plot, times, split.Mean, split.ExtrinsicVariance, split.ExtrinsicStandardError, Palette.Series[1], "extrinsic (between cells)");
        FigureLook.LegendOutside(plot, Edge.Bottom);
        return plot;
    }

    private static void Part(Plot plot, double[] times, double[] mean, double[] variance, double[] error, Color colour, string label)
    {
        // A CV² is undefined where the mean is zero (at the start, before anything is made): NaN breaks the line there.
        double Scaled(int k, double value) => mean[k] > 0 ? value / (mean[k] * mean[k]) : double.NaN;
        var centre = times.Select((_, k) => Scaled(k, variance[k])).ToArray();
        var lower = times.Select((_, k) => Scaled(k, variance[k] - 2 * error[k])).ToArray();
        var upper = times.Select((_, k) => Scaled(k, variance[k] + 2 * error[k])).ToArray();
        MeanBandFigure.FilledBand(plot, times, lower, upper, colour.WithAlpha(0.25), null);
        MeanBandFigure.Lines(plot, times, centre, colour, 2.5f, LinePattern.Solid, ConnectStyle.Straight, label, MarkerShape.FilledCircle);
    }

    private static string Format(double value) => double.IsFinite(value) ? value.ToString("0.####", CultureInfo.InvariantCulture) : "-";

    // Rounded first, so a share that rounds to zero prints "0%", never "-0%".
    private static string Percent(double fraction) => (Math.Round(fraction * 100, 1) + 0.0).ToString("0.#", CultureInfo.InvariantCulture) + "%";
}
