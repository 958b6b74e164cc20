using CopyNumber.Runs;
using System.Globalization;
using CopyNumber.Analysis;

namespace CopyNumber.Reports;

/// <summary>The report of a system-size sweep: the deviation against size on log-log axes and the table of verdicts.</summary>
public static class SweepReport
{
    /// <summary>Builds the report.</summary>
    public static Report Build(string model, SizeSweep sweep, ContrastThresholds thresholds)
    {
        var series = sweep.Points.GroupBy(p => p.Quantity)
            .Select(g => new SweepSeries(g.Key, g.Select(p => p.Size).ToArray(), g.Select(p => p.RelativeDeviation).ToArray(),
                g.Select(p => p.RelativeHalfWidth / Math.Max(thresholds.Z, 1e-9)).ToArray()))
            .ToArray();
        var rows = sweep.Points.Select(p => (IReadOnlyList<string>)
        [
            p.Quantity, Format(p.Size), double.IsNaN(p.RelativeDeviation) ? "none resolved" : $"{Percent(p.RelativeDeviation)} ± {Percent(p.RelativeHalfWidth)}",
            Format(p.CoefficientOfVariation), Format(p.VarianceRatio), p.Verdicts,
        ]).ToList();
        var adequacy = sweep.AdequateFrom.Select(a => a.Value is { } from
            ? $"{a.Key}: the rate equations are adequate from Ω = {Format(from)} on (of the sizes tried)."
            : $"{a.Key}: not adequate at any size tried.").ToList();
        var perSize = sweep.Points.Where(p => p.Folder.Length > 0).GroupBy(p => p.Folder)
            .Select(g => new ReportLink($"Ω = {Format(g.First().Size)}: the run's own report (mean, deviation over time, histograms)", g.Key))
            .ToList();
        var sections = new List<ReportSection>
        {
            new("Where the rate equations become adequate", adequacy,
                [new ReportTable(["quantity", "size Ω", "largest resolved relative deviation", "CV at end", "variance / LNA", "verdicts"], rows)],
                [new ReportFigure("sweep-deviation.png",
                    $"Largest resolved relative deviation of the mean against system size, with a 1/Ω reference slope and the verdict's threshold {Percent(thresholds.RelativeDeviation)} (dotted).",
                    SweepFigure.Render(series, 900, 500, "system size Ω", "relative deviation from rate equation", thresholds.RelativeDeviation))]),
        };
        if (perSize.Count > 0) sections.Add(new ReportSection("Reports at each size", [], [], []) { Links = perSize });
        return new Report($"CopyNumber size sweep: {model}",
            [Contrast.Caution, $"Deviations count only when resolved beyond {Format(thresholds.Z)} standard errors; error bars are one standard error."],
            sections);
    }

    private static string Format(double value) => double.IsNaN(value) ? "-" : value.ToString("0.###", CultureInfo.InvariantCulture);

    private static string Percent(double fraction) => (fraction * 100).ToString("0.##", CultureInfo.InvariantCulture) + "%";
}
