using System.Globalization;
using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The population snapshot beside the lineage: per species one panel with both laws (probability per count)
/// and their means as vertical lines, so the shift of a culture towards young, small cells shows at a glance.
/// </summary>
internal static class SnapshotFigure
{
    /// <summary>One species' two laws.</summary>
    internal sealed record Laws(string Species, long[] LineageCounts, double[] Lineage, double LineageMean, long[] PopulationCounts, double[] Population, double PopulationMean);

    public static FigureImage Render(IReadOnlyList<Laws> species, int width, int height)
    {
        FigureLook.CheckSize(width, height);
        var (panels, columns) = Build(species, width, height);
        return FigureLook.Render(panels, columns, width, height);
    }

    /// <summary>The panels, not yet rendered, and how many go to a row.</summary>
    internal static (List<Plot> Panels, int Columns) Build(IReadOnlyList<Laws> species, int width, int height)
    {
        InputChecks.NotNull(species, "The snapshot's laws");
        var (columns, scale) = FigureLook.PanelGrid(species.Count, width, height);
        var panels = new List<Plot>();
        foreach (var s in species)
        {
            var plot = FigureLook.NewPlot($"{s.Species}: culture snapshot and lineage", FigureLook.Labelled(s.Species, "copies"), "probability per count", scale);
            FigureLook.CountAxis(plot.Axes.Bottom);
            Add(plot, s.LineageCounts, s.Lineage, s.LineageMean, Palette.Blue, "lineage (mother machine)");
            Add(plot, s.PopulationCounts, s.Population, s.PopulationMean, Palette.Vermillion, "population (culture snapshot)");
            if (s.LineageCounts.Length == 0 && s.PopulationCounts.Length == 0) FigureLook.NoDataNote(plot, "no counts recorded", scale);
            else FigureLook.LegendOutside(plot, Edge.Bottom);
            panels.Add(plot);
        }
        if (panels.Count == 0)
        {
            var empty = FigureLook.NewPlot("culture snapshot and lineage", "copy number (copies)", "probability");
            FigureLook.NoDataNote(empty, "no species");
            panels.Add(empty);
        }
        return (panels, columns);
    }

    /// <summary>Most bins a law is drawn in; wider laws are drawn as probability per count averaged over bins of whole counts.</summary>
    private const int MostBins = 80;

    private static void Add(Plot plot, long[] counts, double[] probabilities, double mean, Color color, string label)
    {
        if (counts.Length == 0) return;
        var (xs, ys) = Outline(counts, probabilities);
        var line = plot.Add.Scatter(xs, ys, color);
        line.MarkerSize = 0;
        line.LineWidth = 2;
        line.LegendText = label;
        if (double.IsFinite(mean))
        {
            var marker = plot.Add.VerticalLine(mean, 2, color, LinePattern.Dashed);
            marker.LegendText = $"mean {mean.ToString("G4", CultureInfo.InvariantCulture)}";
        }
    }

    /// <summary>
    /// The law as a histogram's outline: bins of w whole counts (w = 1 up to <see cref="MostBins"/> counts), each at the
    /// mean probability per count of its counts, from count − ½ to count + w − ½, closed to 0 at both ends.
    /// </summary>
    internal static (double[] X, double[] Y) Outline(long[] counts, double[] probabilities)
    {
        var (low, high) = (counts.Min(), counts.Max());
        var width = Math.Max(1, (long)Math.Ceiling((high - low + 1) / (double)MostBins));
        var bins = new double[(high - low) / width + 1];
        for (var i = 0; i < counts.Length; i++) bins[(counts[i] - low) / width] += probabilities[i] / width;
        var xs = new List<double> { low - 0.5 };
        var ys = new List<double> { 0 };
        for (var b = 0; b < bins.Length; b++)
        {
            var left = low + b * width - 0.5;
            xs.AddRange([left, left + width]);
            ys.AddRange([bins[b], bins[b]]);
        }
        xs.Add(xs[^1]);
        ys.Add(0);
        return (xs.ToArray(), ys.ToArray());
    }
}
