namespace CopyNumber.Reports;

/// <summary>
/// Writes a <see cref="Report"/> as Markdown (a .md file and its figures as PNG files in a figures/
/// folder beside it) or as one self-contained HTML file. The report is checked first, so a report that
/// cannot be written writes nothing; problems with the report or with the files raise
/// <see cref="ReportException"/> with a message naming what is wrong. Text is UTF-8 without a byte-order
/// mark, lines end in "\n", and existing files of the same names are replaced. Every file is written
/// through a temporary name and renamed into place (<see cref="Storage.AtomicFile"/>), so a full disk leaves
/// the old file or none under the final name, never a truncated one.
/// </summary>
public static class ReportWriter
{
    /// <summary>Name of the folder, beside the Markdown file, that holds its figures.</summary>
    public const string FigureFolder = "figures";

    /// <summary>
    /// The report as CommonMark text whose figures are image links to
    /// <c>figures/&lt;FileName&gt;</c>; writes nothing.
    /// </summary>
    public static string ToMarkdown(Report report)
    {
        ReportChecks.Validate(report);
        return MarkdownReport.Render(report, FigureFolder);
    }

    /// <summary>
    /// Writes <paramref name="fileName"/> in <paramref name="folder"/> (both created if missing) and every
    /// figure as <c>figures/&lt;FileName&gt;</c> beside it (and its SVG, when it has one, under the same name ending in
    /// ".svg"), linked by relative paths so the folder can be moved as a whole. Returns the full path of the Markdown file.
    /// </summary>
    /// <param name="report">The report.</param>
    /// <param name="folder">Output folder.</param>
    /// <param name="fileName">Name of the Markdown file: a plain file name, no folders.</param>
    public static string WriteMarkdown(Report report, string folder, string fileName = "report.md")
    {
        string markdown = ToMarkdown(report);
        if (string.IsNullOrWhiteSpace(folder)) throw new ReportException("No output folder was given for the Markdown report.");
        if (string.IsNullOrWhiteSpace(fileName) || fileName != Path.GetFileName(fileName) || fileName is "." or "..")
            throw new ReportException($"The Markdown file name '{fileName}' must be a plain file name, without folders.");

        return Guarded(Path.Combine(folder, fileName), () =>
        {
            string path = Path.GetFullPath(Path.Combine(folder, fileName));
            string figures = Path.Combine(Path.GetFullPath(folder), FigureFolder);
            Directory.CreateDirectory(figures);
            foreach (var figure in report.Sections.SelectMany(s => s.Figures))
            {
                Storage.AtomicFile.WriteAllBytes(Path.Combine(figures, figure.FileName), figure.Png);
                if (figure.Svg is { } svg) Storage.AtomicFile.WriteAllText(Path.Combine(figures, figure.SvgFileName), svg);
            }
            Storage.AtomicFile.WriteAllText(path, markdown);
            return path;
        });
    }

    /// <summary>
    /// The report as one HTML document: polyglot HTML5 that is also well-formed XHTML, figures embedded
    /// as <c>&lt;figure&gt;&lt;img src="data:image/png;base64,…"&gt;&lt;figcaption&gt;</c>, tables for
    /// verdicts, inline CSS, no scripts and no external resources loaded; a figure with an SVG links to
    /// <c>figures/&lt;name&gt;.svg</c>, which <see cref="WriteMarkdown"/> writes beside it; writes nothing.
    /// </summary>
    public static string ToHtml(Report report)
    {
        ReportChecks.Validate(report);
        return HtmlReport.Render(report);
    }

    /// <summary>Writes <see cref="ToHtml"/> to <paramref name="path"/>, creating its folder if missing.</summary>
    /// <param name="report">The report.</param>
    /// <param name="path">Path of the HTML file.</param>
    public static void WriteHtml(Report report, string path)
    {
        string html = ToHtml(report);
        if (string.IsNullOrWhiteSpace(path)) throw new ReportException("No output path was given for the HTML report.");
        Guarded(path, () =>
        {
            string full = Path.GetFullPath(path);
            if (Path.GetDirectoryName(full) is { Length: > 0 } directory) Directory.CreateDirectory(directory);
            Storage.AtomicFile.WriteAllText(full, html);
            return full;
        });
    }

    /// <summary>File-system failures become a message naming the file, not a stack trace.</summary>
    private static string Guarded(string path, Func<string> write)
    {
        try { return write(); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or NotSupportedException or ArgumentException)
        {
            throw new ReportException($"Could not write the report to '{path}': {e.Message}", e);
        }
    }
}
