namespace CopyNumber.Reports;

/// <summary>
/// One section of a report, shown in this order: heading, paragraphs, tables, links, figures.
/// </summary>
/// <param name="Heading">Section heading (plain text).</param>
/// <param name="Paragraphs">Paragraphs of plain text; a line break inside one is shown as a space.</param>
/// <param name="Tables">Tables, e.g. verdicts; may be empty.</param>
/// <param name="Figures">Figures; may be empty.</param>
public sealed record ReportSection(
    string Heading,
    IReadOnlyList<string> Paragraphs,
    IReadOnlyList<ReportTable> Tables,
    IReadOnlyList<ReportFigure> Figures)
{
    /// <summary>Links to other runs' reports, shown as a list after the tables; empty by default.</summary>
    public IReadOnlyList<ReportLink> Links { get; init; } = [];
}
