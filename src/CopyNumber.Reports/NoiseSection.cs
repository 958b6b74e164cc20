using System.Globalization;
using CopyNumber.Analysis.Noise;
using CopyNumber.Storage;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The report's answer to "how much of the noise is the cell's own?", as squared coefficients of variation split
/// into the within-cell (intrinsic) and between-cell (extrinsic) parts (Swain, Elowitz &amp; Siggia 2002, PNAS
/// 99:12795), from either design the engine estimates: cells whose parameters vary, several replicates per cell
/// (the law of total variance; <c>noise.parquet</c>, Ensembles/NoiseDecomposition), and pairs of identical
/// reporters in one cell (Elowitz et al. 2002; Analysis/Noise/DualReporterNoise). This section only shows them.
/// </summary>
internal static class NoiseSection
{
    private const int MaxPanels = 6;

    /// <summary>One quantity's split over time, whichever design estimated it; parts are CV², NaN where undefined.</summary>
    private sealed record Split(string Label, string Design, double[] Intrinsic, double[] IntrinsicError, double[] Extrinsic, double[] ExtrinsicError);

    /// <summary>The section, or null when the run has no split (no parameter varies per cell and no reporter pair was named).</summary>
    public static ReportSection? For(Runs.RunContrastResult contrast, string timeUnit, IReadOnlyList<double> scheduleChanges, double z)
    {
        var run = contrast.Run;
        var dualReporters = contrast.DualReporters;
        var splits = run.Noise.Select(Nested).Concat(dualReporters.Select(Dual)).ToList();
        if (splits.Count == 0 && contrast.CellAverage is null && contrast.CellAverageFailure is null) return null;
        var times = run.Times;
        var shown = new[] { times.Length / 2, times.Length - 1 }.Distinct().ToArray();
        var rows = new List<IReadOnlyList<string>>();
        foreach (var split in splits)
            foreach (var k in shown)
            {
                var total = split.Intrinsic[k] + split.Extrinsic[k];
                rows.Add([
                    split.Label, split.Design, Format(times[k]), Format(total),
                    $"{Format(split.Intrinsic[k])} ± {Format(split.IntrinsicError[k])}",
                    $"{Format(split.Extrinsic[k])} ± {Format(split.ExtrinsicError[k])}",
                    total > 0 ? Percent(split.Extrinsic[k] / total) : "-",
                ]);
            }
        var paragraphs = new List<string>();
        if (run.Noise.Count > 0)
            paragraphs.Add($"Some parameters vary from cell to cell; each cell's parameter draw was simulated {run.Noise[0].ReplicatesPerDraw} times (design 'cells'). "
                + "By the law of total variance each quantity's variance is the mean variance within a cell (intrinsic noise) plus the variance of the cell means "
                + "(extrinsic noise; Swain, Elowitz & Siggia 2002). noise.parquet holds the split at every grid time.");
        if (dualReporters.Count > 0)
            paragraphs.Add("Pairs of identical, independent reporters in one cell (design 'reporters') split the noise by the identities of Elowitz, Levine, Siggia & Swain (2002): "
                + "intrinsic ⟨(c − y)²⟩/(2⟨c⟩⟨y⟩), extrinsic Cov(c, y)/(⟨c⟩⟨y⟩), from the run's moments and covariances.parquet; errors by the delta method under normal theory.");
        paragraphs.Add("Both parts are squared coefficients of variation (variance over squared mean) and add up to the total; ± is one standard error.");
        var tables = new List<ReportTable>();
        if (rows.Count > 0)
            tables.Add(new ReportTable(["quantity", "design", $"time ({timeUnit})", "CV² total", "CV² intrinsic", "CV² extrinsic", "extrinsic share of variance"], rows));
        if (contrast.CellAverage is { } average)
        {
            paragraphs.Add($"The mean cell and the average of cells: the rate equations solved at the mean parameters (the contrast's deterministic column) "
                + $"and solved for each of the run's first {average.Draws} cells and averaged (± its Monte Carlo standard error). Where the dynamics depend "
                + "nonlinearly on a varying parameter the two differ, and only the second is the deterministic picture of the population's mean. "
                + $"A deviation of the ensemble mean counts as resolved beyond {Format(z)} combined standard errors.");
            tables.Add(CellAverageTable(run, average, z, timeUnit));
            if (average.Intrinsic is not null && run.Noise.Count > 0)
            {
                paragraphs.Add($"The linear noise approximation over cells predicts the split: solved for each of the same {average.Draws} cells, the mean of their "
                    + "LNA variances is the intrinsic part and the variance of their rate-equation solutions the extrinsic part (law of total variance). "
                    + $"Against the nested design's estimates at the final time; a difference counts as resolved beyond {Format(z)} combined standard errors "
                    + "(exact for networks whose propensities are at most linear in the counts; otherwise the LNA's own error shows here).");
                tables.Add(LnaSplitTable(run, average, z, timeUnit));
                var last = run.Times.Length - 1;
                var heavy = run.Noise.Select(n => (n.Quantity, Column: average.ColumnIndex(n.Quantity)))
                    .Where(n => n.Column >= 0 && average.ExtrinsicKurtosis![last, n.Column] > Analysis.Noise.CellAverage.HeavyTailKurtosis)
                    .Select(n => $"{n.Quantity} (kurtosis {Format(average.ExtrinsicKurtosis![last, n.Column])})").ToList();
                if (heavy.Count > 0)
                    paragraphs.Add($"Caution: the cells' rate-equation solutions are heavy-tailed for {string.Join(", ", heavy)}, against 3 for a normal law; "
                        + $"the extrinsic part from {average.Draws} cells, and its standard error, rest on a fourth moment that so few cells estimate poorly, "
                        + "so the error shown may be much too small. The nested design's extrinsic estimate carries the same caution.");
            }
        }
        if (contrast.CellAverageFailure is { } failure)
            paragraphs.Add(contrast.CellAverage is null ? $"The rate equations averaged over cells could not be computed: {failure}" : $"Note: {failure}.");
        // A quantity that never varies (a conserved gene count) has nothing to split and gets no panel.
        var drawn = splits.Where(s => s.Intrinsic.Zip(s.Extrinsic).Any(p => p.First is not (0 or double.NaN) || p.Second is not (0 or double.NaN))).ToList();
        if (drawn.Count == 0) return new ReportSection("Noise: intrinsic and extrinsic", paragraphs, tables, []);
        var panels = drawn.Take(MaxPanels).Select(split => Panel(split, times, timeUnit, scheduleChanges, drawn.Count > 1 ? 0.8f : 1f)).ToList();
        var columns = panels.Count == 1 ? 1 : 2;
        var height = 420 * ((panels.Count + columns - 1) / columns);
        var caption = "Intrinsic and extrinsic squared coefficients of variation over time; the shaded bands are ±2 standard errors"
            + (drawn.Count > MaxPanels ? $" (the first {MaxPanels} of {drawn.Count} quantities that vary)." : ".");
        var figure = new ReportFigure("noise-split.png", caption, FigureLook.Render(panels, columns, 900, Math.Max(FigureLook.MinPixels, height)));
        return new ReportSection("Noise: intrinsic and extrinsic", paragraphs, tables, [figure]);
    }

    /// <summary>At the final time, per quantity: the ensemble mean against the rate equations of the mean cell and of the average of cells.</summary>
    private static ReportTable CellAverageTable(RunFolder run, Analysis.Noise.CellAverage average, double z, string timeUnit)
    {
        var k = run.Times.Length - 1;
        var rows = new List<IReadOnlyList<string>>();
        foreach (var q in run.Quantities)
        {
            var column = average.ColumnIndex(q.Name);
            if (column < 0) continue;
            var (mean, error) = (q.Mean[k], q.StandardError[k]);
            var meanCell = q.Deterministic[k];
            var (cells, cellsError) = (average.Mean[k, column], average.StandardError[k, column]);
            rows.Add([
                q.Name, $"{Format(mean)} ± {Format(error)}", Format(meanCell), Deviation(mean, meanCell, error, z),
                $"{Format(cells)} ± {Format(cellsError)}", Deviation(mean, cells, Math.Sqrt(error * error + cellsError * cellsError), z),
            ]);
        }
        return new ReportTable(["quantity", "ensemble mean", "mean cell", "deviation from it", "average of cells", "deviation from it"], rows,
            $"At the final time t = {Format(run.Times[k])} {(timeUnit == "time" ? "" : timeUnit)}".TrimEnd() + ".");
    }

    /// <summary>At the final time, per quantity the nested design split: each part measured by the ensemble against the LNA over cells, in variance units.</summary>
    private static ReportTable LnaSplitTable(RunFolder run, Analysis.Noise.CellAverage average, double z, string timeUnit)
    {
        var k = run.Times.Length - 1;
        var rows = new List<IReadOnlyList<string>>();
        foreach (var split in run.Noise)
        {
            var column = average.ColumnIndex(split.Quantity);
            if (column < 0) continue;
            rows.Add([
                split.Quantity,
                $"{Format(split.IntrinsicVariance[k])} ± {Format(split.IntrinsicStandardError[k])}",
                $"{Format(average.Intrinsic![k, column])} ± {Format(average.IntrinsicStandardError![k, column])}",
                Deviation(split.IntrinsicVariance[k], average.Intrinsic[k, column], Combined(split.IntrinsicStandardError[k], average.IntrinsicStandardError[k, column]), z),
                $"{Format(split.ExtrinsicVariance[k])} ± {Format(split.ExtrinsicStandardError[k])}",
                $"{Format(average.Extrinsic![k, column])} ± {Format(average.ExtrinsicStandardError![k, column])}",
                Deviation(split.ExtrinsicVariance[k], average.Extrinsic[k, column], Combined(split.ExtrinsicStandardError[k], average.ExtrinsicStandardError![k, column]), z),
            ]);
        }
        return new ReportTable(["quantity", "intrinsic variance (ensemble)", "LNA over cells", "difference", "extrinsic variance (ensemble)", "LNA over cells", "difference"], rows,
            $"At the final time t = {Format(run.Times[k])} {(timeUnit == "time" ? "" : timeUnit)}".TrimEnd() + "; variances in the quantity's units squared.");
    }

    private static double Combined(double a, double b) => Math.Sqrt(a * a + b * b);

    private static string Deviation(double mean, double reference, double error, double z)
    {
        if (!(Math.Abs(reference) > 0) || !double.IsFinite(mean)) return "-";
        var relative = (mean - reference) / reference;
        var resolved = Math.Abs(mean - reference) > z * error;
        return $"{(relative >= 0 ? "+" : "")}{Percent(relative)}{(resolved ? " (resolved)" : " (within error)")}";
    }

    private static Split Nested(StoredNoiseSplit s)
    {
        // A CV² is undefined where the mean is zero (at the start, before anything is made): NaN breaks the line there.
        double[] Scaled(double[] values) => values.Select((v, k) => s.Mean[k] > 0 ? v / (s.Mean[k] * s.Mean[k]) : double.NaN).ToArray();
        return new Split(s.Quantity, "cells", Scaled(s.IntrinsicVariance), Scaled(s.IntrinsicStandardError), Scaled(s.ExtrinsicVariance), Scaled(s.ExtrinsicStandardError));
    }

    private static Split Dual(DualReporterSplit s) => new($"{s.First}:{s.Second}", "reporters",
        s.Points.Select(p => p.Intrinsic).ToArray(), s.Points.Select(p => p.IntrinsicError).ToArray(),
        s.Points.Select(p => p.Extrinsic).ToArray(), s.Points.Select(p => p.ExtrinsicError).ToArray());

    private static Plot Panel(Split split, double[] times, string timeUnit, IReadOnlyList<double> scheduleChanges, float scale)
    {
        var plot = FigureLook.NewPlot($"{split.Label}: where the noise comes from", "time", "CV² (variance / mean²)", scale);
        FigureLook.TimeAxis(plot, plot.Axes.Bottom, timeUnit == "time" ? null : timeUnit, scheduleChanges, times[0], times[^1]);
        Part(plot, times, split.Intrinsic, split.IntrinsicError, Palette.Series[0], "intrinsic (within a cell)");
        Part(plot, times, split.Extrinsic, split.ExtrinsicError, Palette.Series[1], "extrinsic (between cells)");
        FigureLook.LegendOutside(plot, Edge.Bottom);
        return plot;
    }

    internal static void Part(Plot plot, double[] times, double[] centre, double[] error, Color colour, string label)
    {
        var lower = centre.Select((c, k) => c - 2 * error[k]).ToArray();
        var upper = centre.Select((c, k) => c + 2 * error[k]).ToArray();
        MeanBandFigure.FilledBand(plot, times, lower, upper, colour.WithAlpha(0.25), null);
        MeanBandFigure.Lines(plot, times, centre, colour, 2.5f, LinePattern.Solid, ConnectStyle.Straight, label, MarkerShape.FilledCircle);
    }

    internal static string Format(double value) => double.IsFinite(value) ? value.ToString("0.####", CultureInfo.InvariantCulture) : "-";

    // Rounded first, so a share that rounds to zero prints "0%", never "-0%".
    internal static string Percent(double fraction) => (Math.Round(fraction * 100, 1) + 0.0).ToString("0.#", CultureInfo.InvariantCulture) + "%";
}
