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
    /// <summary>A figure drawn as PNG and SVG; the SVG is written beside the PNG under the same name ending in ".svg".</summary>
    public ReportFigure(string fileName, string caption, FigureImage image, string? altText = null) : this(fileName, caption, image.Png, altText) =>
        Svg = image.Svg;

    /// <summary>The same figure as an SVG document, for papers; null when the figure has none.</summary>
    public string? Svg { get; init; }

    /// <summary>The SVG's file name: <see cref="FileName"/> with ".svg" in place of ".png".</summary>
    public string SvgFileName => Path.ChangeExtension(FileName, ".svg");

    /// <summary>The text alternative actually used: <see cref="AltText"/> or else <see cref="Caption"/>.</summary>
    public string Alt => string.IsNullOrWhiteSpace(AltText) ? Caption : AltText;
}
