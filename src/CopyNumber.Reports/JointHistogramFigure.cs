using System.Globalization;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The joint histogram of two species at one time: a cell per pair of counts, coloured on viridis (Smith &amp; van der
/// Walt 2015; quoted from memory) by its fraction of the replicates divided by the largest cell's at that time, so the
/// picture reads at every time; two states of a toggle appear as two separate bright blobs (the lighter one holding
/// more replicates). Cells no replicate reached are the map's darkest colour.
/// </summary>
/// <param name="First">Species on the horizontal axis.</param>
/// <param name="Second">Species on the vertical axis.</param>
/// <param name="Time">The time, in <paramref name="TimeUnit"/>.</param>
/// <param name="Cells">(first count, second count, fraction of replicates).</param>
/// <param name="Replicates">Replicates counted.</param>
/// <param name="TimeUnit">The model's time unit, or "time".</param>
internal sealed record JointSnapshot(string First, string Second, double Time, IReadOnlyList<(long First, long Second, double Probability)> Cells,
    int Replicates, string TimeUnit);

internal static class JointHistogramFigure
{
    /// <summary>The colour bar's label: which scale the colours are on.</summary>
    internal const string ScaleLabel = "fraction ÷ largest cell at that time";

    public static FigureImage Render(IReadOnlyList<JointSnapshot> snapshots, int width, int height)
    {
        FigureLook.CheckSize(width, height);
        var panels = Build(snapshots);
        return FigureLook.Render(panels, Math.Min(3, Math.Max(1, panels.Count)), width, height);
    }

    /// <summary>One panel per snapshot, all on the same axes (the smallest box holding every snapshot's cells).</summary>
    internal static List<Plot> Build(IReadOnlyList<JointSnapshot> snapshots)
    {
        InputChecks.NotNull(snapshots, "The list of joint snapshots");
        var all = snapshots.SelectMany(s => s.Cells).ToArray();
        if (all.Length == 0)
        {
            var empty = FigureLook.NewPlot("joint histogram", "first (copies)", "second (copies)");
            FigureLook.NoDataNote(empty, "no stored paths to count");
            return [empty];
        }
        long x0 = all.Min(c => c.First), x1 = all.Max(c => c.First), y0 = all.Min(c => c.Second), y1 = all.Max(c => c.Second);
        float scale = snapshots.Count > 1 ? 0.8f : 1f;
        var panels = new List<Plot>();
        foreach (var snap in snapshots)
        {
            string time = snap.Time.ToString("G4", CultureInfo.InvariantCulture);
            string unit = snap.TimeUnit is "time" or "" ? "" : " " + snap.TimeUnit;
            var plot = FigureLook.NewPlot($"t = {time}{unit} ({snap.Replicates} replicates)", FigureLook.Labelled(snap.First, "copies"),
                FigureLook.Labelled(snap.Second, "copies"), scale);
            FigureLook.CountAxis(plot.Axes.Bottom);
            FigureLook.CountAxis(plot.Axes.Left);
            // ScottPlot draws row 0 at the top: the largest second count goes in row 0.
            var cells = new double[y1 - y0 + 1, x1 - x0 + 1];
            double largest = snap.Cells.Count == 0 ? 0 : snap.Cells.Max(c => c.Probability);
            foreach (var (a, b, p) in snap.Cells) cells[y1 - b, a - x0] = largest > 0 ? p / largest : 0;
            var map = plot.Add.Heatmap(HeatmapFigure.AtLeastTwoByTwo(cells));
            map.Colormap = new ScottPlot.Colormaps.Viridis();
            map.ManualRange = new ScottPlot.Range(0, 1);
            map.Extent = new CoordinateRect(x0 - 0.5, x1 + 0.5, y0 - 0.5, y1 + 0.5);
            var bar = plot.Add.ColorBar(map);
            bar.Label = ScaleLabel;
            bar.LabelStyle.FontSize = FigureLook.TickLabelSize * scale;
            bar.LabelStyle.Bold = false;
            plot.Axes.SetLimits(x0 - 0.5, x1 + 0.5, y0 - 0.5, y1 + 0.5);
            panels.Add(plot);
        }
        return panels;
    }
}
