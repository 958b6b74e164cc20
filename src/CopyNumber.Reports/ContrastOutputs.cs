using CopyNumber.Runs;
using CopyNumber.Analysis;
using CopyNumber.Storage;

namespace CopyNumber.Reports;

/// <summary>Writes what <c>contrast</c> produces into a run folder: contrast.parquet, report.md with its figures, report.html.</summary>
public static class ContrastOutputs
{
    /// <summary>File names inside the run folder.</summary>
    public const string TableFile = RunFiles.Contrast, MarkdownFile = RunFiles.ReportMarkdown, HtmlFile = RunFiles.ReportHtml;

    /// <summary>Computes the contrast of the run in <paramref name="folder"/> and writes its table and reports.</summary>
    /// <remarks>The folder is claimed while it is written (<see cref="FolderClaim"/>; within a run that holds it the
    /// claim nests), and the previous contrast's table, reports and figures are removed before the new ones are
    /// written, so no figure of an earlier contrast survives beside the new report.</remarks>
    /// <param name="folder">The run folder.</param>
    /// <param name="thresholds">The verdicts' thresholds.</param>
    /// <param name="histogramTimes">Times whose histograms the report draws.</param>
    /// <param name="heatmapQuantity">The quantity drawn as a heatmap, or null.</param>
    /// <param name="takeOver">Take over a claim on the folder by a run on another host (or one that ended without releasing it).</param>
    /// <param name="pair">Two species whose joint histogram is written (pair.parquet) and drawn at the histogram times, or null.</param>
    /// <param name="dualReporters">Pairs of identical reporter species whose noise the report splits by the dual-reporter identities.</param>
    /// <returns>The contrast and the files written.</returns>
    public static (RunContrastResult Contrast, IReadOnlyList<string> Files) Write(
        string folder, ContrastThresholds thresholds, IReadOnlyList<double> histogramTimes, string? heatmapQuantity, bool takeOver = false,
        (string First, string Second)? pair = null, IReadOnlyList<(string First, string Second)>? dualReporters = null)
    {
        using var claim = FolderClaim.Take(folder, "contrast", takeOverStale: false, takeOver);
        var run = RunFolder.Read(folder);
        ContrastReport.CheckChoices(run.Quantities.Select(q => q.Name).ToList(), run.Times[^1], histogramTimes, heatmapQuantity);
        var contrast = RunContrast.Compute(run, thresholds, dualReporters: dualReporters);
        var metadata = Provenance.For(run.Manifest.ModelFile, run.ModelText,
            new Dictionary<string, string> { ["command"] = "contrast", ["z"] = thresholds.Z.ToString("R", System.Globalization.CultureInfo.InvariantCulture) },
            DateTimeOffset.UtcNow);
        FolderContents.RemoveContrastOutputs(folder);
        var table = Path.Combine(folder, TableFile);
        ContrastTable.Write(table, contrast.Quantities, metadata);
        var written = new List<string> { table };
        if (PhasesTable.Applies(contrast.Quantities))
        {
            var phases = Path.Combine(folder, RunFiles.Phases);
            PhasesTable.Write(phases, contrast.Quantities, metadata);
            written.Add(phases);
        }
        if (contrast.Oscillation is { Species.Count: > 0 } oscillation)
        {
            var spectrum = Path.Combine(folder, RunFiles.OscillationSpectrum);
            var replicates = Path.Combine(folder, RunFiles.OscillationReplicates);
            OscillationSpectrumTable.Write(spectrum, oscillation, metadata);
            OscillationReplicatesTable.Write(replicates, oscillation, metadata);
            written.AddRange([spectrum, replicates]);
        }
        if (contrast.NoiseSources is { } sources)
        {
            var partitionLna = Path.Combine(folder, RunFiles.PartitionLna);
            PartitionLnaTable.Write(partitionLna, sources, metadata);
            written.Add(partitionLna);
        }
        PairHistogram? joint = null;
        if (pair is { } chosen && (joint = PairHistogram.Of(run, chosen.First, chosen.Second)) is not null)
        {
            var pairFile = Path.Combine(folder, RunFiles.Pair);
            JointTable.Write(pairFile, joint.First, joint.Second, run.Times, joint.Laws, metadata);
            written.Add(pairFile);
        }
        var report = ContrastReport.Build(contrast, thresholds, histogramTimes, heatmapQuantity, pair, joint);
        var markdown = ReportWriter.WriteMarkdown(report, folder, MarkdownFile);
        var html = Path.Combine(folder, HtmlFile);
        ReportWriter.WriteHtml(report, html);
        return (contrast, [.. written, markdown, html]);
    }
}
