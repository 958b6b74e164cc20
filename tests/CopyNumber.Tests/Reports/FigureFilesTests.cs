using System.Xml.Linq;
using CopyNumber.Analysis;
using CopyNumber.Reports;
using CopyNumber.Runs;
using CopyNumber.Storage;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// Every report figure is also written as SVG (W3C SVG 1.1: an &lt;svg&gt; root in the SVG namespace with the figure's
/// width and height) beside its PNG and linked from both reports; the sweep report links each size's own report
/// (issue 16). Checked by parsing what was written (common practice).
/// </summary>
public sealed class FigureFilesTests : IDisposable
{
    private static readonly XNamespace Svg = "http://www.w3.org/2000/svg";
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "copynumber-figure-files-" + Guid.NewGuid().ToString("N"));

    public void Dispose()
    {
        if (Directory.Exists(_folder)) Directory.Delete(_folder, recursive: true);
    }

    [Fact]
    public void EveryFigureIsWrittenAsSvgBesideItsPngAndLinkedFromBothReports()
    {
        double[] t = [0, 1, 2, 3];
        var band = new BandSeries("A", t, [1, 2, 3, 4], [0, 1, 2, 3], [2, 3, 4, 5], [1, 2, 3, 4], null, null, []);
        var report = new Report("r", [], [new ReportSection("A", [], [], [new ReportFigure("a-mean.png", "mean", MeanBandFigure.Render(band, 640, 360))])]);

        var markdown = File.ReadAllText(ReportWriter.WriteMarkdown(report, _folder));
        var svgPath = Path.Combine(_folder, "figures", "a-mean.svg");
        Assert.True(File.Exists(svgPath), "figures/a-mean.svg was not written");
        var root = XDocument.Load(svgPath).Root!;
        Assert.Equal(Svg + "svg", root.Name);
        Assert.Equal("640", root.Attribute("width")?.Value);
        Assert.Equal("360", root.Attribute("height")?.Value);
        Assert.Contains(root.Descendants(Svg + "text"), e => e.Value.Contains("mean")); // text stays text, searchable in a paper
        Assert.Contains("(figures/a-mean.svg)", markdown);
        Assert.Contains("href=\"figures/a-mean.svg\"", ReportWriter.ToHtml(report));
    }

    [Fact]
    public void TheSweepReportLinksTheReportOfEverySize()
    {
        ScanCell Cell(long point, double size, double deviation) => new(point, [size], "A", "adequate", [1, 0, 0, 0, 0, 0, 0, 0, 0],
            deviation, 0.01, deviation, 0.01, deviation, 0.01, 0.1, 1, 1, 0, 1, "", 0, RunFiles.ScanPointPrefix + point.ToString("D4"));
        var sweep = SizeSweep.Summarise([Cell(1, 10, 0.05), Cell(2, 100, 0.005)]);
        var report = SweepReport.Build("m", sweep, ContrastThresholds.Default);

        var html = ReportWriter.ToHtml(report);
        Assert.Contains("href=\"point-0001/report.html\"", html);
        Assert.Contains("href=\"point-0002/report.html\"", html);
        var markdown = ReportWriter.ToMarkdown(report);
        Assert.Contains("(point-0001/report.md)", markdown);
        Assert.Contains("(point-0002/report.md)", markdown);
    }
}
