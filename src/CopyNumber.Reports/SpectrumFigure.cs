using ScottPlot;

namespace CopyNumber.Reports;

/// <summary>
/// The replicates' averaged power spectrum with its ±2 standard-error band, and the LNA spectrum where the rate equations
/// settle to a stable steady state; logarithmic power axis (values are log10-transformed, decade ticks).
/// </summary>
internal static class SpectrumFigure
{
    public static FigureImage Render(string species, double[] omega, double[] power, double[] error, double[]? lna, string timeUnit, int width = 900, int height = 500)
    {
        FigureLook.CheckSize(width, height);
        var plot = FigureLook.NewPlot($"{species}: power spectrum", $"angular frequency ω (1/{timeUnit})", "log10 power (copies² × time)");
        // Bin 0 carries the removed mean and is left out.
        var keep = Enumerable.Range(1, omega.Length - 1).Where(k => power[k] > 0).ToArray();
        double[] X(IEnumerable<int> ks) => ks.Select(k => omega[k]).ToArray();
        var lower = keep.Where(k => power[k] - 2 * error[k] > 0).ToArray();
        if (lower.Length > 1)
        {
            var band = plot.Add.FillY(X(lower), lower.Select(k => Math.Log10(power[k] + 2 * error[k])).ToArray(), lower.Select(k => Math.Log10(power[k] - 2 * error[k])).ToArray());
            band.FillColor = Palette.EnsembleBand;
            band.LineWidth = 0;
            band.LegendText = "±2 standard errors";
        }
        var mean = plot.Add.ScatterLine(X(keep), keep.Select(k => Math.Log10(power[k])).ToArray(), Palette.EnsembleMean);
        mean.LineWidth = 1.8f;
        mean.LegendText = "replicates (averaged periodogram)";
        if (lna is not null)
        {
            var positive = keep.Where(k => lna[k] > 0).ToArray();
            var line = plot.Add.ScatterLine(X(positive), positive.Select(k => Math.Log10(lna[k])).ToArray(), Palette.RateEquation);
            line.LineWidth = 2.5f;
            line.LinePattern = LinePattern.Dashed;
            line.LegendText = "linear noise approximation";
        }
        FigureLook.LegendOutside(plot);
        return FigureLook.Render(plot, width, height);
    }
}
