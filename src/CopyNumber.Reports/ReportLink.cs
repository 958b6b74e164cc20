namespace CopyNumber.Reports;

/// <summary>
/// A link from a report to the report of a run in a sub-folder (a sweep's per-size runs): the Markdown report links
/// that folder's report.md, the HTML report its report.html, so each stays within its own format.
/// </summary>
/// <param name="Text">The link's text (plain).</param>
/// <param name="Folder">The sub-folder, relative to the report's folder, with '/' between parts: letters, digits, '.', '_', '-'.</param>
public sealed record ReportLink(string Text, string Folder);
