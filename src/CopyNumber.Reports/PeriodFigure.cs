using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>The distribution of the replicates' periods (a histogram of counts) with the rate equations' period marked.</summary>
internal static class PeriodFigure
{
    public static FigureImage Render(string species, IReadOnlyList<double> periods, double rateEquationPeriod, string timeUnit, int width = 900, int height = 500)
    {
        FigureLook.CheckSize(width, height);
        var plot = FigureLook.NewPlot($"{species}: period of each replicate", FigureLook.Labelled("period", timeUnit), "replicates");
        var finite = periods.Where(double.IsFinite).ToArray();
        if (finite.Length > 0)
        {
            // Square-root rule for the number of bins (common practice).
            var bins = Math.Max(5, (int)Math.Ceiling(Math.Sqrt(finite.Length)));
            double lo = finite.Min(), hi = finite.Max();
            var width1 = hi > lo ? (hi - lo) / bins : 1;
            var counts = new double[bins];
            foreach (var p in finite) counts[Math.Min(bins - 1, (int)((p - lo) / width1))]++;
            var bars = plot.Add.Bars(Enumerable.Range(0, bins).Select(b => lo + (b + 0.5) * width1).ToArray(), counts);
            foreach (var bar in bars.Bars) { bar.Size = width1 * 0.95; bar.FillColor = Palette.EnsembleBand; bar.LineColor = Palette.EnsembleMean; }
            bars.LegendText = $"{finite.Length} replicates";
        }
        if (double.IsFinite(rateEquationPeriod))
        {
            var line = plot.Add.VerticalLine(rateEquationPeriod, 2.5f, Palette.RateEquation);
            line.LegendText = "rate equations";
        }
        FigureLook.LegendOutside(plot);
        return FigureLook.Render(plot, width, height);
    }
}
