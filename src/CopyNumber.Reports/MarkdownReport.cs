using System.Text;

namespace CopyNumber.Reports;

/// <summary>
/// A report as CommonMark text with the figures as image links into a folder beside it. All report text
/// is plain, so every character CommonMark could read as markup is backslash-escaped (CommonMark spec
/// 0.31, §2.4: any ASCII punctuation may be escaped; quoted from memory).
/// </summary>
internal static class MarkdownReport
{
    public static string Render(Report report, string figureFolder)
    {
        var md = new StringBuilder();
        md.Append("# ").Append(Inline(report.Title)).Append("\n\n");
        if (report.Cautions.Count > 0)
        {
            md.Append("> **Cautions**\n>\n");
            foreach (string caution in report.Cautions) md.Append("> - ").Append(Inline(caution)).Append('\n');
            md.Append('\n');
        }

        foreach (var section in report.Sections)
        {
            md.Append("## ").Append(Inline(section.Heading)).Append("\n\n");
            foreach (string paragraph in section.Paragraphs) md.Append(Inline(paragraph)).Append("\n\n");
            foreach (var table in section.Tables) AppendTable(md, table);
            foreach (var link in section.Links)
                md.Append("- [").Append(Inline(link.Text)).Append("](").Append(link.Folder).Append('/').Append(Storage.RunFiles.ReportMarkdown).Append(")\n");
            if (section.Links.Count > 0) md.Append('\n');
            foreach (var figure in section.Figures)
            {
                // File names are restricted to [A-Za-z0-9._-], so the link needs no escaping.
                md.Append("![").Append(Inline(figure.Alt)).Append("](").Append(figureFolder).Append('/')
                  .Append(figure.FileName).Append(")\n\n");
                md.Append('*').Append(Inline(figure.Caption)).Append('*');
                if (figure.Svg is not null) md.Append(" [SVG](").Append(figureFolder).Append('/').Append(figure.SvgFileName).Append(')');
                md.Append("\n\n");
            }
        }
        return md.ToString();
    }

    private static void AppendTable(StringBuilder md, ReportTable table)
    {
        if (!string.IsNullOrEmpty(table.Caption)) md.Append("**").Append(Inline(table.Caption)).Append("**\n\n");
        AppendRow(md, table.Header);
        md.Append('|');
        for (int i = 0; i < table.Header.Count; i++) md.Append(" --- |");
        md.Append('\n');
        foreach (var row in table.Rows) AppendRow(md, row);
        md.Append('\n');
    }

    private static void AppendRow(StringBuilder md, IReadOnlyList<string> cells)
    {
        md.Append('|');
        foreach (string cell in cells) md.Append(' ').Append(Inline(cell)).Append(" |");
        md.Append('\n');
    }

    /// <summary>
    /// One line of plain text made literal in CommonMark: line breaks become spaces; characters that
    /// open or close inline markup anywhere (emphasis, code, links, raw HTML, entities, table cells,
    /// strike-through) are backslash-escaped, and so are those that start a block only at the start of
    /// the line (heading, list item, thematic break).
    /// </summary>
    public static string Inline(string text)
    {
        const string anywhere = "\\`*_[]<>|~&";
        const string atStart = "#+-=";
        text = text.TrimStart(); // four leading spaces would make an indented code block
        var escaped = new StringBuilder(text.Length + 8);
        int leadingDigits = 0;
        while (leadingDigits < text.Length && char.IsAsciiDigit(text[leadingDigits])) leadingDigits++;
        for (int i = 0; i < text.Length; i++)
        {
            char c = text[i];
            if (c is '\r' or '\n') { escaped.Append(' '); continue; }
            if (char.IsControl(c)) { escaped.Append('\uFFFD'); continue; }
            bool opensBlock = (i == 0 && atStart.Contains(c)) || (i == leadingDigits && i > 0 && c is '.' or ')');
            if (anywhere.Contains(c) || opensBlock) escaped.Append('\\');
            escaped.Append(c);
        }
        return escaped.ToString();
    }
}
