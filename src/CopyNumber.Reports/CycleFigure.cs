using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// A few replicates' sample paths of one species from the oscillation sample, beside the rate equations' solution over the
/// same times (which runs on its cycle there): the replicates keep the cycle's shape but drift out of phase with it.
/// </summary>
internal static class CycleFigure
{
    public const int PathsDrawn = 4;

    public static FigureImage Render(string species, double start, double step, IReadOnlyList<double[]> paths, double[] rateEquations, string timeUnit, int width = 900, int height = 500)
    {
        FigureLook.CheckSize(width, height);
        var plot = FigureLook.NewPlot($"{species}: sample paths and the rate equations", FigureLook.Labelled("time", timeUnit), FigureLook.Labelled(species, "copies"));
        var times = Enumerable.Range(0, rateEquations.Length).Select(k => start + k * step).ToArray();
        for (var r = 0; r < Math.Min(PathsDrawn, paths.Count); r++)
        {
            var line = plot.Add.ScatterLine(times, paths[r], Palette.Series[(r + 2) % Palette.Series.Length].WithAlpha(0.8));
            line.LineWidth = 1.2f;
            if (r == 0) line.LegendText = $"replicates 1–{Math.Min(PathsDrawn, paths.Count)}";
        }
        var cycle = plot.Add.ScatterLine(times, rateEquations, Palette.RateEquation);
        cycle.LineWidth = 2.5f;
        cycle.LegendText = "rate equations";
        FigureLook.LegendOutside(plot);
        return FigureLook.Render(plot, width, height);
    }
}
