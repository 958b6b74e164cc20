namespace CopyNumber.Reports;

/// <summary>One figure drawn twice from the same plot: PNG for the reports, SVG (vector, text as text) for papers.</summary>
/// <param name="Png">PNG bytes.</param>
/// <param name="Svg">SVG document (UTF-8 text).</param>
public sealed record FigureImage(byte[] Png, string Svg);
