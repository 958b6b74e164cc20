using CopyNumber.Analysis;
using CopyNumber.Storage;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The report's answer to "how much of the noise of a dividing cell comes from partitioning at division?"
/// (Huh &amp; Paulsson 2011, Nat. Genet. 43:95), beside the intrinsic/extrinsic split of <see cref="NoiseSection"/>: the
/// linear noise approximation's variance split exactly into the part fed by the reactions and the part fed by the
/// partitioning variance (Analysis/Noise/LnaNoiseSources; <c>partition-lna.parquet</c>), and, when the run had its
/// control (<c>--partition-noise</c>; <c>partition.parquet</c>), the variance binomial partitioning adds over a control
/// whose cells split in halves, with its standard error. This section only shows them.
/// </summary>
internal static class PartitionSection
{
    private const int MaxPanels = 6;

    /// <summary>The section, or null when no cell divides.</summary>
    public static ReportSection? For(Runs.RunContrastResult contrast, string timeUnit, IReadOnlyList<double> scheduleChanges)
    {
        if (contrast.Network.Cycle is null) return null;
        var run = contrast.Run;
        var lna = contrast.NoiseSources;
        var ensemble = run.Partition.ToDictionary(p => p.Quantity);
        var paragraphs = new List<string>
        {
            "A dividing cell's noise has two sources: the reactions' own randomness and the random sharing of molecules at division (partitioning; Huh & Paulsson 2011). "
            + "The linear noise approximation is linear in its noise sources, so its variance splits exactly into the part the reactions feed and the part the "
            + "partitioning variance of each division feeds, both carried by the same dynamics (partition-lna.parquet; the parts add up to the LNA variance to rounding). "
            + "It follows the mean cell and, like the LNA everywhere, is exact only for networks whose rates are linear in the counts.",
        };
        if (lna is null)
            paragraphs.Add($"The linear noise approximation's split could not be computed: {contrast.NoiseSourcesFailure ?? contrast.ExpansionFailure ?? "the expansion is missing"}.");
        if (ensemble.Count > 0)
            paragraphs.Add("The run also has its control (--partition-noise): as many replicates whose cells split every count in halves (⌊n/2⌋ or ⌈n/2⌉ for odd n), "
                + "on independent streams; gene copies are shared as in the run, so their partitioning is not in this difference (it is in the LNA's part). "
                + "The difference of the two variances is what binomial partitioning adds beyond the least error integer counts allow, "
                + "± one standard error from the two samples' fourth moments (partition.parquet). For a nonlinear network the sources interact (a partition error "
                + "changes the rates the reactions then run at), so the difference is the whole effect of binomial partitioning, interactions included.");
        if (ensemble.Count > 0 && contrast.Network.Variability.Any)
            paragraphs.Add("Some parameters vary from cell to cell: the ensemble's variances include that extrinsic part and the LNA's (at the mean parameters) do not, "
                + "so the two shares are of different totals.");
        if (ensemble.Count == 0)
            paragraphs.Add("The ensemble's own split needs a control run: simulate again with --partition-noise (it doubles the cost).");

        var times = run.Times;
        var shown = new[] { times.Length / 2, times.Length - 1 }.Distinct().ToArray();
        var quantities = run.Quantities.Select(q => q.Name).Where(name => Varies(name, lna, ensemble)).ToList();
        var rows = new List<IReadOnlyList<string>>();
        foreach (var name in quantities)
            foreach (var k in shown)
            {
                var column = lna?.ColumnIndex(name) ?? -1;
                var (total, partitioning) = column >= 0 ? (lna!.Variance(k, column), lna.Sources!.Partitioning(k, column)) : (double.NaN, double.NaN);
                var e = ensemble.GetValueOrDefault(name);
                rows.Add([
                    name, NoiseSection.Format(times[k]), NoiseSection.Format(total),
                    column >= 0 ? NoiseSection.Format(lna!.Sources!.Reactions(k, column)) : "-",
                    column >= 0 ? $"{NoiseSection.Format(partitioning)} ({(total > 0 ? NoiseSection.Percent(partitioning / total) : "-")})" : "-",
                    e is null ? "-" : $"{NoiseSection.Format(e.Variance[k])} ± {NoiseSection.Format(e.VarianceStandardError[k])}",
                    e is null ? "-" : $"{NoiseSection.Format(e.ControlVariance[k])} ± {NoiseSection.Format(e.ControlStandardError[k])}",
                    e is null ? "-" : $"{NoiseSection.Format(e.Added[k])} ± {NoiseSection.Format(e.AddedStandardError[k])} ({ShareText(e.Share[k], e.ShareStandardError[k])})",
                ]);
            }
        var tables = rows.Count == 0 ? new List<ReportTable>() :
        [
            new ReportTable(["quantity", $"time ({timeUnit})", "LNA variance", "reactions' part", "partitioning part (share)", "ensemble variance",
                "control (halves)", "partitioning adds (share)"], rows, "Variances in copies² (readouts in their units squared); ± is one standard error."),
        ];
        if (quantities.Count == 0) return new ReportSection("Noise: partitioning and reactions", paragraphs, tables, []);
        var panels = quantities.Take(MaxPanels).Select(name => Panel(name, times, lna, ensemble.GetValueOrDefault(name), timeUnit, scheduleChanges, quantities.Count > 1 ? 0.8f : 1f)).ToList();
        var columns = panels.Count == 1 ? 1 : 2;
        var height = 420 * ((panels.Count + columns - 1) / columns);
        var caption = "The share of each quantity's variance that partitioning at division feeds: the LNA's exact split (line) and, with --partition-noise, "
            + "the ensemble's 1 − Var(halves)/Var(binomial) with ±2 standard errors (band)"
            + (quantities.Count > MaxPanels ? $"; the first {MaxPanels} of {quantities.Count} quantities that vary." : ".");
        var figure = new ReportFigure("noise-partition.png", caption, FigureLook.Render(panels, columns, 900, Math.Max(FigureLook.MinPixels, height)));
        return new ReportSection("Noise: partitioning and reactions", paragraphs, tables, [figure]);
    }

    // A quantity that never varies (a gene copy number shared exactly) has nothing to split.
    private static bool Varies(string name, SystemSizeExpansionSolution? lna, IReadOnlyDictionary<string, StoredPartitionSplit> ensemble)
    {
        var column = lna?.ColumnIndex(name) ?? -1;
        var inLna = column >= 0 && Enumerable.Range(0, lna!.Grid.Count).Any(k => lna.Variance(k, column) > 1e-9);
        return inLna || (ensemble.TryGetValue(name, out var e) && e.Variance.Any(v => v > 0));
    }

    private static string ShareText(double share, double error) =>
        double.IsFinite(share) ? $"{NoiseSection.Percent(share)} ± {NoiseSection.Percent(error)}" : "-";

    private static Plot Panel(string name, double[] times, SystemSizeExpansionSolution? lna, StoredPartitionSplit? ensemble, string timeUnit,
        IReadOnlyList<double> scheduleChanges, float scale)
    {
        var plot = FigureLook.NewPlot($"{name}: share of the variance from partitioning", "time", "share of the variance", scale);
        FigureLook.TimeAxis(plot, plot.Axes.Bottom, timeUnit == "time" ? null : timeUnit, scheduleChanges, times[0], times[^1]);
        if (ensemble is not null)
            NoiseSection.Part(plot, times, ensemble.Share, ensemble.ShareStandardError, Palette.Series[1], "ensemble: binomial against halves");
        if (lna is not null && lna.ColumnIndex(name) is var column and >= 0)
        {
            var share = times.Select((_, k) => lna.Variance(k, column) > 0 ? lna.Sources!.Partitioning(k, column) / lna.Variance(k, column) : double.NaN).ToArray();
            MeanBandFigure.Lines(plot, times, share, Palette.Series[0], 2.5f, LinePattern.Solid, ConnectStyle.Straight, "LNA: partitioning part", MarkerShape.None);
        }
        FigureLook.LegendOutside(plot, Edge.Bottom);
        return plot;
    }
}
