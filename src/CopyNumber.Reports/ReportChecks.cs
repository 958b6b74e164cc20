using System.Text.RegularExpressions;

namespace CopyNumber.Reports;

/// <summary>Checks a <see cref="Report"/> before anything is written, so a bad report writes no files.</summary>
internal static partial class ReportChecks
{
    [GeneratedRegex(@"^[A-Za-z0-9][A-Za-z0-9._-]*\.png$", RegexOptions.IgnoreCase | RegexOptions.CultureInvariant)]
    private static partial Regex FigureFileName();

    // Relative folders only, no "..": a link stays inside the report's folder.
    [GeneratedRegex(@"^[A-Za-z0-9][A-Za-z0-9._-]*(/[A-Za-z0-9][A-Za-z0-9._-]*)*$", RegexOptions.CultureInvariant)]
    private static partial Regex LinkFolder();

    public static void Validate(Report report)
    {
        InputChecks.NotNull(report, "The report");
        InputChecks.NotNull(report.Title, "The report's title");
        InputChecks.NotNull(report.Cautions, "The report's list of cautions");
        InputChecks.NotNull(report.Sections, "The report's list of sections");
        if (report.Cautions.Any(c => c is null)) throw new ReportException("A caution of the report is missing (null).");

        var fileNames = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (var section in report.Sections)
        {
            InputChecks.NotNull(section, "A section of the report");
            string where = $"Section '{section.Heading}'";
            InputChecks.NotNull(section.Heading, "A section heading");
            InputChecks.NotNull(section.Paragraphs, $"{where}: the list of paragraphs");
            InputChecks.NotNull(section.Tables, $"{where}: the list of tables");
            InputChecks.NotNull(section.Figures, $"{where}: the list of figures");
            if (section.Paragraphs.Any(p => p is null)) throw new ReportException($"{where}: a paragraph is missing (null).");
            for (int t = 0; t < section.Tables.Count; t++) CheckTable(section.Tables[t], $"{where}, table {t + 1}");
            foreach (var figure in section.Figures) CheckFigure(figure, where, fileNames);
            InputChecks.NotNull(section.Links, $"{where}: the list of links");
            foreach (var link in section.Links)
                if (link?.Text is null || link.Folder is null || !LinkFolder().IsMatch(link.Folder))
                    throw new ReportException($"{where}: a link to '{link?.Folder}' is not a relative folder of letters, digits, '.', '_' and '-'.");
        }
    }

    private static void CheckTable(ReportTable table, string where)
    {
        InputChecks.NotNull(table, where);
        InputChecks.NotNull(table.Header, $"{where}: the header");
        InputChecks.NotNull(table.Rows, $"{where}: the rows");
        if (table.Header.Count == 0) throw new ReportException($"{where}: the header has no columns.");
        if (table.Header.Any(h => h is null)) throw new ReportException($"{where}: a column heading is missing (null).");
        for (int r = 0; r < table.Rows.Count; r++)
        {
            var row = table.Rows[r] ?? throw new ReportException($"{where}: row {r + 1} is missing (null).");
            if (row.Count != table.Header.Count)
                throw new ReportException($"{where}: row {r + 1} has {row.Count} cells but the header has {table.Header.Count}.");
            if (row.Any(c => c is null)) throw new ReportException($"{where}: row {r + 1} has a missing (null) cell.");
        }
    }

    private static void CheckFigure(ReportFigure figure, string where, HashSet<string> fileNames)
    {
        InputChecks.NotNull(figure, $"{where}: a figure");
        InputChecks.NotNull(figure.Caption, $"{where}: the caption of figure '{figure.FileName}'");
        if (figure.FileName is null || !FigureFileName().IsMatch(figure.FileName))
            throw new ReportException(
                $"{where}: figure file name '{figure.FileName}' is not allowed; use letters, digits, '.', '_' and '-', " +
                "starting with a letter or digit and ending in \".png\".");
        if (!fileNames.Add(figure.FileName))
            throw new ReportException($"{where}: figure file name '{figure.FileName}' is used twice (names are compared ignoring case).");
        if (PngHeader.TryReadSize(figure.Png) is null)
            throw new ReportException($"{where}: figure '{figure.FileName}' does not hold a PNG image.");
    }
}
