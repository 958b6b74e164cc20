namespace CopyNumber.Reports;

/// <summary>
/// A report of a "contrast" or "sweep" run, written by <see cref="ReportWriter"/> as Markdown with
/// figure files or as one self-contained HTML file. All text is plain and escaped on output.
/// </summary>
/// <param name="Title">Report title.</param>
/// <param name="Cautions">Warnings the reader must see before the results (e.g. too few replicates); shown first, may be empty.</param>
/// <param name="Sections">The sections, in order.</param>
public sealed record Report(string Title, IReadOnlyList<string> Cautions, IReadOnlyList<ReportSection> Sections);
