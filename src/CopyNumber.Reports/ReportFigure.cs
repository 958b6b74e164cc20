namespace CopyNumber.Reports;

/// <summary>A figure of a report: a PNG image with a caption.</summary>
/// <param name="FileName">
/// File name used when the report is written as Markdown (the image goes to figures/<paramref name="FileName"/>):
/// letters, digits, '.', '_' and '-' only, starting with a letter or digit, ending in ".png", unique
/// within the report regardless of case.
/// </param>
/// <param name="Caption">Caption shown under the figure (plain text).</param>
/// <param name="Png">The PNG bytes, e.g. from <see cref="Figures"/>.</param>
/// <param name="AltText">Text alternative for readers who cannot see the image; the caption when null.</param>
public sealed record ReportFigure(string FileName, string Caption, byte[] Png, string? AltText = null)
{
    /// <summary>The text alternative actually used: <see cref="AltText"/> or else <see cref="Caption"/>.</summary>
    public string Alt => string.IsNullOrWhiteSpace(AltText) ? Caption : AltText;
}
