using CopyNumber.Network;
using CopyNumber.Reports;
using ScottPlot;
using ScottPlot.Plottables;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// What the figures show, read from ScottPlot's layout after a render (<see cref="PlotLayout"/>), not from pixels:
/// that no legend hides a plotted point or line (issue 16: the histograms' legend covered the rate-equation line,
/// the sweep's legend a point), that schedule changes are marked on time axes at the times the network's
/// <see cref="Timeline"/> gives, that time axes carry the model's unit, that only counts are labelled "copies",
/// that the sweep draws the verdict's threshold and a tick at every decade, and that the deviation figure shows the
/// contrast's own numbers with the threshold. Keeping the legend out of the data is common practice.
/// </summary>
public sealed class FigureLayoutTests
{
    private static double LogFactorial(long k)
    {
        double s = 0;
        for (long i = 2; i <= k; i++) s += Math.Log(i);
        return s;
    }

    /// <summary>Poisson(λ), the stationary law of immigration–death (Gardiner 2009, Stochastic Methods, §11.1; quoted from memory).</summary>
    private static HistogramSnapshot Poisson(double time, double lambda, double rateEquation)
    {
        long[] counts = Enumerable.Range(0, 60).Select(k => (long)k).ToArray();
        double[] p = counts.Select(k => Math.Exp(k * Math.Log(lambda) - lambda - LogFactorial(k))).ToArray();
        return new HistogramSnapshot("mRNA", time, counts, p, rateEquation, "min");
    }

    private static BandSeries Band(IReadOnlyList<double>? changes = null)
    {
        double[] t = Enumerable.Range(0, 121).Select(i => i * 0.5).ToArray();
        // Immigration–death mean m(t) = 40(1 − e^(−t/8)) (common practice); the paths sit at the band's top right,
        // where a legend inside the data used to be drawn.
        double[] re = t.Select(x => 40 * (1 - Math.Exp(-x / 8))).ToArray();
        double[] sd = re.Select(Math.Sqrt).ToArray();
        return new BandSeries("mRNA", t, re, re.Select((v, i) => v - 1.645 * sd[i]).ToArray(), re.Select((v, i) => v + 1.645 * sd[i]).ToArray(),
            re, re.Select((v, i) => v - 2 * sd[i]).ToArray(), re.Select((v, i) => v + 2 * sd[i]).ToArray(),
            [re.Select((v, i) => Math.Round(v + 2 * sd[i])).ToArray()], "minute") { ScheduleChanges = changes ?? [] };
    }

    [Fact]
    public void HistogramLegendsHideNoBarAndNoRateEquationLine()
    {
        // The rate-equation value near the top of the range, where the legend of every panel used to sit.
        var (panels, _) = HistogramFigure.Build([Poisson(1, 4, 4), Poisson(20, 30, 55), Poisson(50, 38, 58)], 900, 500);
        foreach (var panel in panels)
        {
            Assert.Empty(PlotLayout.HiddenByLegend(panel, 300, 500));
            Assert.NotNull(PlotLayout.Legend(panel)); // the legend is still there, beside the data
        }
    }

    [Fact]
    public void MeanHeatmapSweepDeviationAndScanLegendsHideNoPoint()
    {
        Assert.Empty(PlotLayout.HiddenByLegend(MeanBandFigure.Build(Band([12.5, 40])), 900, 500));

        double[] t = Enumerable.Range(0, 30).Select(i => (double)i).ToArray();
        var p = new double[t.Length, 31];
        for (int i = 0; i < t.Length; i++) p[i, i] = 1.0;
        Assert.Empty(PlotLayout.HiddenByLegend(HeatmapFigure.Build(new DistributionHeatmap("A", t, 0, 30, p, t, "s")), 900, 500));

        // A series whose largest size has the largest deviation: a point in the upper right corner.
        double[] sizes = [1, 3, 10, 30, 100, 300, 1000];
        var sweep = SweepFigure.Build([
            new SweepSeries("A", sizes, sizes.Select(o => 0.4 / o).ToArray(), sizes.Select(o => 0.05 / o).ToArray()),
            new SweepSeries("B", sizes, [0.3, 0.1, 0.05, 0.02, 0.05, 0.1, 0.45], new double[7]),
        ], "system size Ω", "relative deviation", 0.1);
        Assert.Empty(PlotLayout.HiddenByLegend(sweep, 900, 500));

        double[] relative = t.Select(x => 0.4 * Math.Exp(-x / 5)).ToArray();
        var deviation = DeviationFigure.Build("A", t, relative, relative.Select(_ => 0.05).ToArray(), 0.1, 3, "s", [10]);
        Assert.Empty(PlotLayout.HiddenByLegend(deviation, 900, 450));

        double[] xs = [1, 10, 100, 1000];
        var curves = ScanFigures.BuildCurves("noise", "k", true, "CV", [("A", xs, [0.1, 0.2, 0.4, 0.9], null), ("B", xs, [0.9, 0.5, 0.3, 0.95], null)], [0.5]);
        Assert.Empty(PlotLayout.HiddenByLegend(curves, 900, 450));
    }

    /// <summary>
    /// scenarios/inducer_pulse.cnet raises the inducer at time 50 and halves the protein at time 100 (its 'changes'
    /// block); the figure marks exactly those instants, and labels its time axis with the model's unit.
    /// </summary>
    [Fact]
    public void ScheduleChangesAreMarkedAtTheTimesTheModelWrites()
    {
        var model = ModelLoader.Load(Path.Combine(RepositoryRoot(), "scenarios", "inducer_pulse.cnet")).Model!;
        var changes = ScheduleMarks.Of(model.Network, new TimeGrid(200, 1));
        Assert.Equal([50.0, 100.0], changes);

        var plot = MeanBandFigure.Build(Band() with { Time = Band().Time.Select(x => x * 3).ToArray() } with { ScheduleChanges = changes });
        PlotLayout.Render(plot, 900, 500);
        var marks = plot.GetPlottables().OfType<VerticalLine>().Select(l => l.X).Order().ToArray();
        Assert.Equal([50.0, 100.0], marks);
        Assert.Equal("time (minute)", plot.Axes.Bottom.Label.Text);
        Assert.Contains(plot.Legend.GetItems(), item => item.LabelText == "schedule change");

        // A change after the shown times is not drawn: Band() ends at t = 60, so 100 is left out.
        var shorter = MeanBandFigure.Build(Band([50, 100]));
        Assert.Equal([50.0], shorter.GetPlottables().OfType<VerticalLine>().Select(l => l.X).ToArray());
    }

    [Fact]
    public void OnlyCountsAreLabelledCopies()
    {
        var model = ModelLoader.Load(Path.Combine(RepositoryRoot(), "scenarios", "inducer_pulse.cnet")).Model!;
        Assert.True(ContrastReport.IsCount(model.Network, "protein"));
        Assert.True(ContrastReport.IsCount(model.Network, "expressed"));               // mrna + protein
        Assert.False(ContrastReport.IsCount(model.Network, "protein_concentration")); // protein / size

        var real = MeanBandFigure.Build(Band() with { Species = "protein_concentration", CountUnit = "", IsCount = false });
        Assert.Equal("protein_concentration", real.Axes.Left.Label.Text);
        var count = MeanBandFigure.Build(Band());
        Assert.Equal("mRNA (copies)", count.Axes.Left.Label.Text);
    }

    [Fact]
    public void SweepDrawsTheThresholdAndATickAtEveryDecade()
    {
        double[] sizes = [1, 10, 100, 1000, 10000];
        var plot = SweepFigure.Build([new SweepSeries("A", sizes, sizes.Select(o => 0.5 / o).ToArray(), new double[5])], "system size Ω", "relative deviation", 0.1);
        PlotLayout.Render(plot, 900, 500);
        var threshold = Assert.Single(plot.GetPlottables().OfType<HorizontalLine>());
        Assert.Equal(Math.Log10(0.1), threshold.Y, 12);
        var majors = plot.Axes.Bottom.TickGenerator.Ticks.Where(t => t.IsMajor).Select(t => t.Position).ToArray();
        foreach (var decade in new[] { 0.0, 1, 2, 3, 4 }) Assert.Contains(majors, m => Math.Abs(m - decade) < 1e-12);
        var yMajors = plot.Axes.Left.TickGenerator.Ticks.Where(t => t.IsMajor).Select(t => t.Label).ToArray();
        Assert.Contains("10⁻¹", yMajors); // the threshold's decade is on the axis
    }

    [Fact]
    public void DeviationFigureShowsTheContrastsNumbersBandAndThreshold()
    {
        double[] t = [0, 1, 2, 3, 4, 5];
        double[] relative = [double.NaN, 0.3, 0.2, 0.12, 0.05, 0.01];
        double[] half = [double.NaN, 0.04, 0.04, 0.03, 0.03, 0.02];
        var plot = DeviationFigure.Build("A", t, relative, half, 0.1, 3, "s", []);
        PlotLayout.Render(plot, 900, 450);
        var limits = plot.Axes.GetLimits();
        Assert.True(limits.Top >= 0.34 && limits.Bottom <= -0.1, $"the band 0.01 − 0.02 … 0.3 + 0.04 and the threshold −0.1 are on the axis: {limits}");
        var lines = plot.GetPlottables().OfType<HorizontalLine>().Select(l => l.Y).Order().ToArray();
        Assert.Equal([-0.1, 0, 0.1], lines);
        var mean = plot.GetPlottables().OfType<Scatter>().Single(s => s.LegendText == "relative deviation");
        Assert.Equal(relative[1..], mean.Data.GetScatterPoints().Select(c => c.Y).ToArray()); // the NaN at t = 0 is a gap
        Assert.Equal("time (s)", plot.Axes.Bottom.Label.Text);
    }

    internal static string RepositoryRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "CopyNumber.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new InvalidOperationException("CopyNumber.sln not found above the test binaries");
    }
}
