using System.Text.RegularExpressions;
using System.Xml;
using System.Xml.Linq;
using CopyNumber.Reports;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// The HTML report is parsed browser-free as XML (it is written as polyglot HTML5/XHTML, W3C Polyglot
/// Markup note), and every figure of the report must be found as an embedded data: image (RFC 2397)
/// whose base64 decodes to exactly that figure's PNG bytes; all text must round-trip through the parser
/// unchanged, which proves it was escaped. The Markdown report's image links must point at files that
/// exist and hold those bytes. Sources: PNG specification (W3C/ISO 15948), CommonMark spec, common practice.
/// </summary>
public sealed class ReportWriterTests : IDisposable
{
    private static readonly XNamespace X = "http://www.w3.org/1999/xhtml";
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "copynumber-reports-" + Guid.NewGuid().ToString("N"));

    public void Dispose()
    {
        if (Directory.Exists(_folder)) Directory.Delete(_folder, recursive: true);
    }

    // Text meant to break naive output: markup, entities, quotes, Markdown syntax, a control character.
    private const string Nasty = "A<b>&amp;\"'</b> *em* _u_ [l](x) | `c` \u0001 # ± Ω";

    private static Report SampleReport()
    {
        double[] t = [0, 1, 2, 3];
        var band = new BandSeries(Nasty, t, [1, 2, 3, 4], [0, 1, 2, 3], [2, 3, 4, 5], [1, 2, 3, 4], null, null, []);
        byte[] meanPng = Figures.MeanWithBands(band, 400, 300);
        byte[] histPng = Figures.Histograms([new HistogramSnapshot("B", 1, [0, 1, 2], [0.2, 0.5, 0.3], 1.1)], 400, 300);
        byte[] sweepPng = Figures.SweepLogLog([new SweepSeries("B", [10, 100], [0.1, 0.01], [0.01, 0.001])], 400, 300);
        return new Report(
            Title: "Contrast of " + Nasty,
            Cautions: ["Only 20 replicates: tails are rough.", "1 < 2 & 3 > 2"],
            Sections:
            [
                new ReportSection("Verdicts",
                    ["Each species is compared with the rate equation.", "Second\nparagraph with " + Nasty],
                    [new ReportTable(["species", "check", "verdict"],
                        [["A", "mean within 5 SE", "pass"], [Nasty, "variance | LNA", "fail <no>"]], "Checks at t = 10")],
                    [new ReportFigure("mean_A.png", "Mean of " + Nasty, meanPng)]),
                new ReportSection("Distributions", [], [],
                [
                    new ReportFigure("hist-B.png", "Histogram of B", histPng, AltText: "Bars of probability against copies"),
                    new ReportFigure("sweep.B.png", "Sweep", sweepPng),
                ]),
            ]);
    }

    private static XDocument ParseXhtml(string html)
    {
        var settings = new XmlReaderSettings { DtdProcessing = DtdProcessing.Parse, XmlResolver = null };
        using var reader = XmlReader.Create(new StringReader(html), settings);
        return XDocument.Load(reader);
    }

    /// <summary>The text CommonMark/XML readers should see after escaping: what the writer is given, minus forbidden controls.</summary>
    private static string Visible(string text) => text.Replace('\u0001', '\uFFFD');

    [Fact]
    public void HtmlIsWellFormedAndEmbedsEveryFigureAsItsOwnPng()
    {
        var report = SampleReport();
        var doc = ParseXhtml(ReportWriter.ToHtml(report));
        Assert.Equal(X + "html", doc.Root!.Name);

        var figures = report.Sections.SelectMany(s => s.Figures).ToList();
        var elements = doc.Descendants(X + "figure").ToList();
        Assert.Equal(figures.Count, elements.Count);
        for (int i = 0; i < figures.Count; i++)
        {
            var img = Assert.Single(elements[i].Elements(X + "img"));
            string src = (string)img.Attribute("src")!;
            const string prefix = "data:image/png;base64,";
            Assert.StartsWith(prefix, src);
            byte[] decoded = Convert.FromBase64String(src[prefix.Length..]);
            Assert.Equal(figures[i].Png, decoded);
            var (w, h) = PngDecoder.ReadSize(decoded);
            Assert.Equal((400, 300), (w, h));
            Assert.Equal(w.ToString(), (string)img.Attribute("width")!);
            Assert.Equal(Visible(figures[i].Alt), (string)img.Attribute("alt")!);
            Assert.Equal(Visible(figures[i].Caption), (string)elements[i].Element(X + "figcaption")!);
        }
    }

    [Fact]
    public void HtmlEscapesAllTextAndLoadsNothingFromOutside()
    {
        var report = SampleReport();
        var doc = ParseXhtml(ReportWriter.ToHtml(report));

        Assert.Equal(Visible(report.Title), (string)doc.Descendants(X + "title").Single());
        Assert.Equal(Visible(report.Title), (string)doc.Descendants(X + "h1").Single());
        Assert.Equal(report.Cautions, doc.Descendants(X + "li").Select(li => (string)li));
        Assert.Equal(["Cautions", "Verdicts", "Distributions"], doc.Descendants(X + "h2").Select(h => (string)h));
        Assert.Contains(doc.Descendants(X + "p"), p => (string)p == Visible("Second\nparagraph with " + Nasty));

        // The verdict table: header cells and body cells exactly as given.
        var table = doc.Descendants(X + "table").Single();
        Assert.Equal("Checks at t = 10", (string)table.Element(X + "caption")!);
        Assert.Equal(["species", "check", "verdict"], table.Descendants(X + "th").Select(th => (string)th));
        var rows = table.Element(X + "tbody")!.Elements(X + "tr")
            .Select(tr => tr.Elements(X + "td").Select(td => (string)td).ToArray()).ToArray();
        Assert.Equal(["A", "mean within 5 SE", "pass"], rows[0]);
        Assert.Equal([Visible(Nasty), "variance | LNA", "fail <no>"], rows[1]);

        // Self-contained: no scripts, no linked resources, every src a data: URI, no element injected by the text.
        Assert.Empty(doc.Descendants(X + "script"));
        Assert.Empty(doc.Descendants(X + "link"));
        Assert.Empty(doc.Descendants(X + "b"));
        Assert.All(doc.Descendants().Attributes("src"), a => Assert.StartsWith("data:", a.Value));
        Assert.All(doc.Descendants().Attributes("href"), a => Assert.Fail($"unexpected link {a.Value}"));
        Assert.Single(doc.Descendants(X + "style"));
    }

    [Fact]
    public void WriteHtmlWritesOneFileThatParses()
    {
        string path = Path.Combine(_folder, "nested", "report.html");
        ReportWriter.WriteHtml(SampleReport(), path);
        Assert.True(File.Exists(path));
        Assert.Equal(3, ParseXhtml(File.ReadAllText(path)).Descendants(X + "img").Count());
        Assert.Single(Directory.GetFiles(Path.GetDirectoryName(path)!)); // nothing written beside it
    }

    [Fact]
    public void MarkdownLinksPointAtFigureFilesThatExistAndHoldTheFigures()
    {
        var report = SampleReport();
        string mdPath = ReportWriter.WriteMarkdown(report, _folder);
        Assert.Equal(Path.Combine(Path.GetFullPath(_folder), "report.md"), mdPath);
        string markdown = File.ReadAllText(mdPath);

        // CommonMark image syntax ![alt](destination); the alt text may contain backslash escapes.
        var links = Regex.Matches(markdown, @"!\[(?:\\.|[^\]\\])*\]\(([^)\s]+)\)").Select(m => m.Groups[1].Value).ToList();
        var figures = report.Sections.SelectMany(s => s.Figures).ToList();
        Assert.Equal(figures.Count, links.Count);
        for (int i = 0; i < figures.Count; i++)
        {
            Assert.False(Path.IsPathRooted(links[i]), "links are relative");
            string file = Path.Combine(_folder, links[i]);
            Assert.True(File.Exists(file), $"{links[i]} does not exist");
            Assert.Equal(figures[i].Png, File.ReadAllBytes(file));
            Assert.Equal(Path.Combine(_folder, "figures"), Path.GetDirectoryName(Path.GetFullPath(file)));
        }
    }

    [Fact]
    public void MarkdownEscapesTextSoItCannotBecomeMarkup()
    {
        string md = ReportWriter.ToMarkdown(SampleReport());
        // CommonMark §2.4: a backslash before ASCII punctuation makes it literal.
        Assert.Contains(@"\*em\* \_u\_ \[l\](x) \| \`c\`", md);
        Assert.Contains(@"A\<b\>\&amp;", md);
        Assert.DoesNotContain("\u0001", md, StringComparison.Ordinal);
        Assert.Contains("| species | check | verdict |", md);
        Assert.Contains("| --- | --- | --- |", md);
        Assert.Contains(@"| fail \<no\> |", md);
        Assert.Contains("Second paragraph", md); // a line break inside a paragraph becomes a space

        // Block markers only matter at the start of a line: there they are escaped, elsewhere left alone.
        string Para(string text) => ReportWriter.ToMarkdown(new Report("T", [], [new ReportSection("S", [text], [], [])]));
        Assert.Contains("\n\\# not a heading\n", Para("# not a heading"));
        Assert.Contains("\n\\- not a list\n", Para("- not a list"));
        Assert.Contains("\n12\\. not a list\n", Para("12. not a list"));
        Assert.Contains("\nt = 0.5 - 1\n", Para("t = 0.5 - 1"));
    }

    [Fact]
    public void ABadReportIsRefusedWithAMessageAndWritesNothing()
    {
        var report = SampleReport();
        var png = report.Sections[0].Figures[0].Png;

        void Refused(Report bad, string expected)
        {
            var e = Assert.Throws<ReportException>(() => ReportWriter.WriteMarkdown(bad, _folder));
            Assert.Contains(expected, e.Message);
            Assert.Throws<ReportException>(() => ReportWriter.WriteHtml(bad, Path.Combine(_folder, "r.html")));
            Assert.False(Directory.Exists(_folder), "nothing may be written for a refused report");
        }

        ReportSection WithFigures(params ReportFigure[] figures) => new("S", [], [], figures);
        Refused(report with { Sections = [WithFigures(new("a.png", "x", png), new("A.PNG", "y", png))] }, "used twice");
        Refused(report with { Sections = [WithFigures(new ReportFigure("../a.png", "x", png))] }, "not allowed");
        Refused(report with { Sections = [WithFigures(new ReportFigure("a.jpg", "x", png))] }, "not allowed");
        Refused(report with { Sections = [WithFigures(new ReportFigure("a.png", "x", [1, 2, 3]))] }, "does not hold a PNG");
        Refused(report with { Sections = [new("S", [], [new ReportTable(["a", "b"], [["1"]])], [])] }, "row 1 has 1 cells but the header has 2");

        var e = Assert.Throws<ReportException>(() => ReportWriter.WriteMarkdown(report, _folder, "sub/report.md"));
        Assert.Contains("plain file name", e.Message);
    }
}
