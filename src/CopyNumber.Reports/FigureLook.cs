using ScottPlot;
using SkiaSharp;

namespace CopyNumber.Reports;

/// <summary>
/// The look shared by all figures (fonts, sizes, frame, grid, legend) and their rendering to PNG.
/// Sizes are chosen so that a 900 × 500 figure reads at a glance when shown at its natural size.
/// </summary>
internal static class FigureLook
{
    public const int MinPixels = 200;
    public const int MaxPixels = 8000;

    public const float TitleSize = 19;
    public const float AxisLabelSize = 16;
    public const float TickLabelSize = 13;
    public const float LegendSize = 14;
    public const float NoteSize = 15;

    // Sans-serif families in order of preference; if none is installed ScottPlot keeps its own default,
    // so rendering never depends on a particular font being present.
    private static readonly string[] PreferredFonts = ["DejaVu Sans", "Liberation Sans", "Noto Sans", "Arial", "Helvetica"];
    private static readonly Lazy<string?> ChosenFont = new(() => PreferredFonts.FirstOrDefault(SafeFontExists));

    /// <summary>"time (min)"; just "time" when the unit is blank or only repeats the quantity.</summary>
    public static string Labelled(string quantity, string? unit) =>
        string.IsNullOrWhiteSpace(unit) || unit == quantity ? quantity : $"{quantity} ({unit})";

    public static void CheckSize(int width, int height)
    {
        if (width < MinPixels || width > MaxPixels || height < MinPixels || height > MaxPixels)
            throw new ReportException(
                $"A figure must be between {MinPixels} and {MaxPixels} pixels on each side; {width} × {height} was asked for.");
    }

    /// <summary>A plot with our look; <paramref name="scale"/> shrinks text for small panels.</summary>
    public static Plot NewPlot(string title, string xLabel, string yLabel, float scale = 1f)
    {
        var plot = new Plot();
        if (ChosenFont.Value is { } font) plot.Font.Set(font);

        plot.FigureBackground.Color = Colors.White;
        plot.DataBackground.Color = Colors.White;
        // An open frame (left and bottom only) with a light grid under the data: the data are the figure.
        plot.Axes.Frame(true);
        plot.Axes.Top.FrameLineStyle.Width = 0;
        plot.Axes.Right.FrameLineStyle.Width = 0;
        plot.Axes.Left.FrameLineStyle.Color = Palette.Ink;
        plot.Axes.Bottom.FrameLineStyle.Color = Palette.Ink;
        plot.Grid.MajorLineColor = Palette.Grid;
        plot.Grid.MinorLineColor = Colors.Transparent;

        plot.Title(title, TitleSize * scale);
        plot.Axes.Title.Label.ForeColor = Palette.Ink;
        plot.XLabel(xLabel, AxisLabelSize * scale);
        plot.YLabel(yLabel, AxisLabelSize * scale);
        foreach (var axis in new IAxis[] { plot.Axes.Bottom, plot.Axes.Left })
        {
            axis.Label.Bold = false;
            axis.Label.ForeColor = Palette.Ink;
            axis.TickLabelStyle.FontSize = TickLabelSize * scale;
            axis.TickLabelStyle.ForeColor = Palette.Ink;
        }

        plot.Legend.FontSize = LegendSize * scale;
        plot.Legend.OutlineColor = Palette.Grid;
        plot.Legend.ShadowColor = Colors.Transparent;
        plot.Legend.BackgroundColor = Colors.White.WithAlpha(0.9);
        return plot;
    }

    /// <summary>Copy numbers are whole: their axis gets whole-number ticks only.</summary>
    public static void CountAxis(IAxis axis) =>
        axis.TickGenerator = new ScottPlot.TickGenerators.NumericAutomatic { IntegerTicksOnly = true };

    /// <summary>Says in the data area why it is empty, so an empty figure is not mistaken for a broken one.</summary>
    public static void NoDataNote(Plot plot, string text, float scale = 1f, Alignment alignment = Alignment.MiddleCenter)
    {
        var note = plot.Add.Annotation(text, alignment);
        note.LabelStyle.FontSize = NoteSize * scale;
        note.LabelStyle.ForeColor = Palette.Note;
        note.LabelStyle.BackgroundColor = Colors.White;
        note.LabelStyle.BorderColor = Palette.Grid;
        note.LabelStyle.ShadowColor = Colors.Transparent;
    }

    public static FigureImage Render(Plot plot, int width, int height) => Render([plot], 1, width, height);

    /// <summary>
    /// The layout of <paramref name="count"/> panels sharing width × height: up to 3 in a row, else about a square,
    /// and the text scale, which shrinks with the panel but not below what is still legible.
    /// </summary>
    public static (int Columns, float Scale) PanelGrid(int count, int width, int height)
    {
        var columns = count <= 3 ? Math.Max(1, count) : (int)Math.Ceiling(Math.Sqrt(count));
        var rows = Math.Max(1, (count + columns - 1) / columns);
        return (columns, (float)Math.Clamp(Math.Min(width / (double)columns / 600.0, height / (double)rows / 420.0), 0.6, 1.0));
    }

    /// <summary>
    /// Panels laid out row by row, <paramref name="columns"/> to a row, filling width × height, drawn twice from the
    /// same plots: once to PNG for the reports, once to SVG (vector, for papers).
    /// </summary>
    public static FigureImage Render(IReadOnlyList<Plot> panels, int columns, int width, int height)
    {
        using var surface = SKSurface.Create(new SKImageInfo(width, height, SKColorType.Rgba8888, SKAlphaType.Premul))
            ?? throw new ReportException($"Could not allocate a {width} × {height} image for a figure.");
        Draw(surface.Canvas, panels, columns, width, height);
        using var image = surface.Snapshot();
        using var png = image.Encode(SKEncodedImageFormat.Png, 100);

        using var svgStream = new MemoryStream();
        using (var svgCanvas = SKSvgCanvas.Create(new SKRect(0, 0, width, height), svgStream))
            Draw(svgCanvas, panels, columns, width, height); // the SVG is complete once its canvas is disposed
        return new FigureImage(png.ToArray(), System.Text.Encoding.UTF8.GetString(svgStream.ToArray()));
    }

    private static void Draw(SKCanvas canvas, IReadOnlyList<Plot> panels, int columns, int width, int height)
    {
        int rows = (panels.Count + columns - 1) / columns;
        float cellWidth = (float)width / columns, cellHeight = (float)height / rows;
        canvas.Clear(SKColors.White);
        for (int i = 0; i < panels.Count; i++)
        {
            float left = i % columns * cellWidth, top = i / columns * cellHeight;
            // A plot clears the canvas before drawing; the clip keeps it from erasing its neighbours.
            canvas.Save();
            canvas.ClipRect(new SKRect(left, top, left + cellWidth, top + cellHeight));
            panels[i].Render(canvas, new PixelRect(left, left + cellWidth, top + cellHeight, top));
            canvas.Restore();
        }
    }

    /// <summary>
    /// Every legend sits outside the data, in a panel to the right of it, so no legend ever hides a point or a line
    /// (issue 16: the histograms' legend covered the rate-equation line, the sweep's a point).
    /// </summary>
    public static void LegendOutside(Plot plot, Edge edge = Edge.Right)
    {
        plot.ShowLegend(edge);
        plot.Legend.Orientation = edge is Edge.Top or Edge.Bottom ? Orientation.Horizontal : Orientation.Vertical;
    }

    /// <summary>
    /// A time axis: "time (unit)" and a thin dotted vertical line at every schedule change inside the shown times, the
    /// first one named in the legend. The change times come from the network's <c>Timeline</c> (<see cref="ScheduleMarks"/>).
    /// </summary>
    public static void TimeAxis(Plot plot, IAxis axis, string? timeUnit, IReadOnlyList<double> scheduleChanges, double from, double to)
    {
        axis.Label.Text = Labelled("time", timeUnit);
        bool named = false;
        foreach (double t in scheduleChanges)
        {
            if (!(t > from) || !(t <= to)) continue;
            var line = plot.Add.VerticalLine(t, 1.5f, Palette.Schedule, LinePattern.Dotted);
            if (!named) line.LegendText = "schedule change";
            named = true;
        }
    }

    private static bool SafeFontExists(string name)
    {
        // A missing family may come back as null or as a substitute; only the family asked for counts.
        try { return Fonts.GetTypeface(name, false, false) is { } face && face.FamilyName == name; }
        catch (Exception) { return false; } // a broken font configuration must not stop a report
    }
}
