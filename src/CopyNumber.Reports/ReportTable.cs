namespace CopyNumber.Reports;

/// <summary>A table of text cells, e.g. one verdict per species and check.</summary>
/// <param name="Header">Column headings; at least one.</param>
/// <param name="Rows">Rows of cells, each with exactly as many cells as <paramref name="Header"/>.</param>
/// <param name="Caption">Optional line said above the table.</param>
/// <remarks>All text is plain: it is escaped on output, never interpreted as markup.</remarks>
public sealed record ReportTable(
    IReadOnlyList<string> Header,
    IReadOnlyList<IReadOnlyList<string>> Rows,
    string? Caption = null);
