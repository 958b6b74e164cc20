using System.Globalization;
using System.Text;

namespace CopyNumber.Reports;

/// <summary>
/// A report as one HTML file that needs nothing else: figures are embedded as data: URIs (RFC 2397), the
/// style sheet is inline, there are no scripts and a Content-Security-Policy forbids loading anything.
/// The markup is polyglot — both valid HTML5 and well-formed XML (W3C, "Polyglot Markup: A robust profile
/// of the HTML vocabulary", Working Group Note, 2015; quoted from memory) — so browsers and XML tools read it alike.
/// </summary>
internal static class HtmlReport
{
    private const string Style = """
        body { font-family: "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; color: #222; background: #fff;
               max-width: 62rem; margin: 2rem auto; padding: 0 1rem; line-height: 1.5; }
        h1 { font-size: 1.7rem; border-bottom: 3px solid #0072B2; padding-bottom: .3rem; }
        h2 { font-size: 1.3rem; margin-top: 2.2rem; }
        .cautions { border-left: 6px solid #D55E00; background: #FDF1E8; padding: .6rem 1rem; margin: 1rem 0; }
        .cautions h2 { margin: 0 0 .3rem 0; font-size: 1.1rem; }
        table { border-collapse: collapse; margin: 1rem 0; font-variant-numeric: tabular-nums; }
        caption { text-align: left; font-weight: bold; padding-bottom: .3rem; }
        th, td { border: 1px solid #ccc; padding: .3rem .7rem; text-align: left; vertical-align: top; }
        thead th { background: #EEF5FA; }
        figure { margin: 1.5rem 0; }
        figure img { max-width: 100%; height: auto; border: 1px solid #e4e4e4; }
        figcaption { font-size: .95rem; color: #444; margin-top: .3rem; }
        """;

    public static string Render(Report report)
    {
        var html = new StringBuilder();
        html.Append("<!DOCTYPE html>\n");
        html.Append("<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\" xml:lang=\"en\">\n<head>\n");
        html.Append("<meta charset=\"utf-8\" />\n");
        html.Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\" />\n");
        html.Append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; img-src data:; style-src 'unsafe-inline'\" />\n");
        html.Append("<title>").Append(Escape(report.Title)).Append("</title>\n");
        html.Append("<style>\n").Append(Style).Append("\n</style>\n</head>\n<body>\n<main>\n");
        html.Append("<h1>").Append(Escape(report.Title)).Append("</h1>\n");

        if (report.Cautions.Count > 0)
        {
            html.Append("<section class=\"cautions\">\n<h2>Cautions</h2>\n<ul>\n");
            foreach (string caution in report.Cautions) html.Append("<li>").Append(Escape(caution)).Append("</li>\n");
            html.Append("</ul>\n</section>\n");
        }

        foreach (var section in report.Sections)
        {
            html.Append("<section>\n<h2>").Append(Escape(section.Heading)).Append("</h2>\n");
            foreach (string paragraph in section.Paragraphs) html.Append("<p>").Append(Escape(paragraph)).Append("</p>\n");
            foreach (var table in section.Tables) AppendTable(html, table);
            if (section.Links.Count > 0)
            {
                html.Append("<ul>\n");
                foreach (var link in section.Links)
                    html.Append("<li><a href=\"").Append(Escape(link.Folder)).Append('/').Append(Storage.RunFiles.ReportHtml).Append("\">")
                        .Append(Escape(link.Text)).Append("</a></li>\n");
                html.Append("</ul>\n");
            }
            foreach (var figure in section.Figures) AppendFigure(html, figure);
            html.Append("</section>\n");
        }
        html.Append("</main>\n</body>\n</html>\n");
        return html.ToString();
    }

    private static void AppendTable(StringBuilder html, ReportTable table)
    {
        html.Append("<table>\n");
        if (!string.IsNullOrEmpty(table.Caption)) html.Append("<caption>").Append(Escape(table.Caption)).Append("</caption>\n");
        html.Append("<thead>\n<tr>");
        foreach (string heading in table.Header) html.Append("<th scope=\"col\">").Append(Escape(heading)).Append("</th>");
        html.Append("</tr>\n</thead>\n<tbody>\n");
        foreach (var row in table.Rows)
        {
            html.Append("<tr>");
            foreach (string cell in row) html.Append("<td>").Append(Escape(cell)).Append("</td>");
            html.Append("</tr>\n");
        }
        html.Append("</tbody>\n</table>\n");
    }

    private static void AppendFigure(StringBuilder html, ReportFigure figure)
    {
        var (width, height) = PngHeader.TryReadSize(figure.Png)
            ?? throw new ReportException($"Figure '{figure.FileName}' does not hold a PNG image.");
        html.Append("<figure>\n<img alt=\"").Append(Escape(figure.Alt)).Append('"')
            .Append(" width=\"").Append(width.ToString(CultureInfo.InvariantCulture)).Append('"')
            .Append(" height=\"").Append(height.ToString(CultureInfo.InvariantCulture)).Append('"')
            .Append(" src=\"data:image/png;base64,").Append(Convert.ToBase64String(figure.Png)).Append("\" />\n");
        html.Append("<figcaption>").Append(Escape(figure.Caption));
        // The SVG is a file beside the report (figures/, written with the Markdown), linked rather than embedded.
        if (figure.Svg is not null)
            html.Append(" <a href=\"").Append(ReportWriter.FigureFolder).Append('/').Append(Escape(figure.SvgFileName)).Append("\">SVG</a>");
        html.Append("</figcaption>\n</figure>\n");
    }

    /// <summary>
    /// Text safe in both element content and quoted attributes. Characters XML forbids (most C0 controls,
    /// lone surrogates, U+FFFE/U+FFFF; XML 1.0 §2.2) become U+FFFD, so odd input never breaks the file.
    /// </summary>
    public static string Escape(string text)
    {
        var escaped = new StringBuilder(text.Length + 16);
        for (int i = 0; i < text.Length; i++)
        {
            char c = text[i];
            switch (c)
            {
                case '&': escaped.Append("&amp;"); break;
                case '<': escaped.Append("&lt;"); break;
                case '>': escaped.Append("&gt;"); break;
                case '"': escaped.Append("&quot;"); break;
                case '\'': escaped.Append("&#39;"); break;
                default:
                    if (char.IsHighSurrogate(c) && i + 1 < text.Length && char.IsLowSurrogate(text[i + 1]))
                    {
                        escaped.Append(c).Append(text[++i]);
                    }
                    else if (c is '\t' or '\n' or '\r' || (c >= 0x20 && c < 0xD800) || (c >= 0xE000 && c <= 0xFFFD))
                    {
                        escaped.Append(c);
                    }
                    else
                    {
                        escaped.Append('\uFFFD');
                    }
                    break;
            }
        }
        return escaped.ToString();
    }
}
