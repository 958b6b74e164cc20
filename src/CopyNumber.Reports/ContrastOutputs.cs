using CopyNumber.Runs;
using CopyNumber.Analysis;
using CopyNumber.Storage;

namespace CopyNumber.Reports;

/// <summary>Writes what <c>contrast</c> produces into a run folder: contrast.parquet, report.md with its figures, report.html.</summary>
public static class ContrastOutputs
{
    /// <summary>File names inside the run folder.</summary>
    public const string TableFile = "contrast.parquet", MarkdownFile = "report.md", HtmlFile = "report.html";

    /// <summary>Computes the contrast of the run in <paramref name="folder"/> and writes its table and reports.</summary>
    /// <returns>The contrast and the files written.</returns>
    public static (RunContrastResult Contrast, IReadOnlyList<string> Files) Write(
        string folder, ContrastThresholds thresholds, IReadOnlyList<double> histogramTimes, string? heatmapQuantity)
    {
        var run = RunFolder.Read(folder);
        ContrastReport.CheckChoices(run.Quantities.Select(q => q.Name).ToList(), run.Times[^1], histogramTimes, heatmapQuantity);
        var contrast = RunContrast.Compute(run, thresholds);
        var metadata = Provenance.For(run.Manifest.ModelFile, run.ModelText,
            new Dictionary<string, string> { ["command"] = "contrast", ["z"] = thresholds.Z.ToString("R", System.Globalization.CultureInfo.InvariantCulture) },
            DateTimeOffset.UtcNow);
        var table = Path.Combine(folder, TableFile);
        ContrastTable.Write(table, contrast.Quantities, metadata);
        var report = ContrastReport.Build(contrast, thresholds, histogramTimes, heatmapQuantity);
        var markdown = ReportWriter.WriteMarkdown(report, folder, MarkdownFile);
        var html = Path.Combine(folder, HtmlFile);
        ReportWriter.WriteHtml(report, html);
        return (contrast, [table, markdown, html]);
    }
}
