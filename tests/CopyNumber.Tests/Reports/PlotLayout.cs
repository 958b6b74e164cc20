using ScottPlot;
using ScottPlot.Panels;
using ScottPlot.Plottables;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// What a rendered ScottPlot figure shows, read from the plot's own layout after a render rather than from pixels: the
/// data rectangle, the legend's rectangle (a legend panel beside the data, or a legend drawn inside it), and the pixel
/// positions of every plotted point and line.
/// </summary>
internal static class PlotLayout
{
    /// <summary>Renders <paramref name="plot"/> at the size asked for, so its layout is known.</summary>
    public static RenderDetails Render(Plot plot, int width, int height)
    {
        plot.GetImage(width, height).Dispose();
        return plot.RenderManager.LastRender;
    }

    /// <summary>The legend's rectangle in figure pixels, or null when the figure has no legend.</summary>
    public static PixelRect? Legend(Plot plot)
    {
        var render = plot.RenderManager.LastRender;
        var layout = render.Layout;
        using var paint = Paint.NewDisposablePaint();
        foreach (var (panel, offset) in layout.PanelOffsets)
            if (panel is LegendPanel && panel.IsVisible)
                return panel.GetPanelRect(layout.DataRect, layout.PanelSizes[panel], offset, paint);
        if (!plot.Legend.IsVisible || plot.Legend.GetItems().Length == 0) return null;
        // A legend inside the data: the size its layout asks for, placed at its alignment with its margin.
        var inside = plot.Legend.GetLayout(new PixelSize(render.DataRect.Width, render.DataRect.Height), paint).LegendRect;
        return inside.AlignedInside(render.DataRect, plot.Legend.Alignment, plot.Legend.Margin);
    }

    /// <summary>
    /// Pixels of everything drawn as data: every point of a scatter, the top of every bar, and points every 2 px along
    /// straight lines (vertical, horizontal and two-point lines) within the data rectangle. Bands and maps are areas and are
    /// left out; what matters for a legend is that it hides no point or line.
    /// </summary>
    public static List<Pixel> DataPixels(Plot plot)
    {
        var data = plot.RenderManager.LastRender.DataRect;
        var pixels = new List<Pixel>();
        foreach (var p in plot.GetPlottables())
        {
            switch (p)
            {
                case Scatter scatter:
                    foreach (var c in scatter.Data.GetScatterPoints())
                        if (double.IsFinite(c.X) && double.IsFinite(c.Y)) pixels.Add(plot.GetPixel(c));
                    break;
                case BarPlot bars:
                    foreach (var bar in bars.Bars) pixels.Add(plot.GetPixel(new Coordinates(bar.Position, bar.Value)));
                    break;
                case VerticalLine line:
                    var x = plot.GetPixel(new Coordinates(line.X, 0)).X;
                    for (var y = data.Top; y <= data.Bottom; y += 2) pixels.Add(new Pixel(x, y));
                    break;
                case HorizontalLine line:
                    var yh = plot.GetPixel(new Coordinates(0, line.Y)).Y;
                    for (var xh = data.Left; xh <= data.Right; xh += 2) pixels.Add(new Pixel(xh, yh));
                    break;
                case LinePlot segment:
                    var a = plot.GetPixel(segment.Start);
                    var b = plot.GetPixel(segment.End);
                    var steps = Math.Max(1, (int)(Math.Sqrt(Math.Pow(b.X - a.X, 2) + Math.Pow(b.Y - a.Y, 2)) / 2));
                    for (var i = 0; i <= steps; i++) pixels.Add(new Pixel(a.X + (b.X - a.X) * i / steps, a.Y + (b.Y - a.Y) * i / steps));
                    break;
            }
        }
        return pixels.Where(px => data.Contains(px)).ToList();
    }

    /// <summary>The data pixels that lie under the legend (none when the figure has no legend).</summary>
    public static List<Pixel> HiddenByLegend(Plot plot, int width, int height)
    {
        Render(plot, width, height);
        return Legend(plot) is { } legend ? DataPixels(plot).Where(px => legend.Contains(px)).ToList() : [];
    }
}
