using CopyNumber.Reports;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// Every figure renders headless to a valid PNG of the size asked for — checked with the test's own PNG
/// reader (<see cref="PngDecoder"/>, from the PNG specification) — for normal, NaN-laden, single-point and
/// empty inputs. Where a figure must draw or must not draw something, the check counts pixels of that
/// element's Okabe–Ito colour (Okabe &amp; Ito 2008; hex values quoted from memory): lines of 2.5 px and
/// more have opaque cores of exactly that colour, and no other element uses it.
/// </summary>
public sealed class FigureTests
{
    private static readonly (byte R, byte G, byte B) Blue = (0x00, 0x72, 0xB2);       // ensemble mean, first series
    private static readonly (byte R, byte G, byte B) Vermillion = (0xD5, 0x5E, 0x00); // rate equation, second series

    private static PngDecoder AssertPng(byte[] png, int width, int height)
    {
        Assert.Equal((width, height), PngDecoder.ReadSize(png));
        var image = PngDecoder.Decode(png);
        Assert.Equal(width, image.Width);
        Assert.Equal(height, image.Height);
        return image;
    }

    private static int Count(PngDecoder image, (byte R, byte G, byte B) c) => image.CountNear(c.R, c.G, c.B);

    // --- mean with bands -------------------------------------------------------------------------

    /// <summary>Logistic-free toy data: immigration–death mean m(t) = 40(1 − e^(−t/8)) (common practice).</summary>
    private static BandSeries Band(int n = 81)
    {
        double[] t = Enumerable.Range(0, n).Select(i => i * 0.5).ToArray();
        double[] re = t.Select(x => 40 * (1 - Math.Exp(-x / 8))).ToArray();
        double[] sd = re.Select(v => Math.Sqrt(v)).ToArray();
        return new BandSeries("mRNA", t,
            Mean: re.Select(v => 0.97 * v).ToArray(),
            Lower05: re.Select((v, i) => v - 1.645 * sd[i]).ToArray(),
            Upper95: re.Select((v, i) => v + 1.645 * sd[i]).ToArray(),
            RateEquation: re,
            LnaLower: re.Select((v, i) => v - 2 * sd[i]).ToArray(),
            LnaUpper: re.Select((v, i) => v + 2 * sd[i]).ToArray(),
            SamplePaths: [re.Select(v => Math.Round(v)).ToArray(), re.Select(v => Math.Round(v + 3)).ToArray()],
            TimeUnit: "min");
    }

    [Fact]
    public void MeanWithBandsRendersThePngAskedForWithMeanAndRateEquationDrawn()
    {
        var image = AssertPng(Figures.MeanWithBands(Band()), 900, 500);
        Assert.True(Count(image, Blue) > 500, "the ensemble mean line is missing");
        Assert.True(Count(image, Vermillion) > 500, "the rate-equation line is missing");

        AssertPng(Figures.MeanWithBands(Band(), 640, 360), 640, 360);
    }

    [Fact]
    public void MeanWithBandsSkipsNaNPointsAndBreaksTheLinesThere()
    {
        var s = Band();
        double[] mean = (double[])s.Mean.Clone(), lower = (double[])s.Lower05.Clone(), lna = (double[])s.LnaUpper!.Clone();
        for (int i = 20; i < 30; i++) mean[i] = double.NaN;
        lower[5] = double.NaN;
        lna[^1] = double.NaN;
        double[] t = (double[])s.Time.Clone();
        t[40] = double.NaN;
        var image = AssertPng(Figures.MeanWithBands(s with { Time = t, Mean = mean, Lower05 = lower, LnaUpper = lna }), 900, 500);
        Assert.True(Count(image, Blue) > 300);
    }

    [Fact]
    public void AnAllNaNSeriesDrawsNothingButTheFigureStillRenders()
    {
        var s = Band();
        double[] nan = Enumerable.Repeat(double.NaN, s.Time.Length).ToArray();

        var noMean = AssertPng(Figures.MeanWithBands(s with { Mean = nan }), 900, 500);
        Assert.Equal(0, Count(noMean, Blue));            // neither the line nor its legend entry
        Assert.True(Count(noMean, Vermillion) > 500);    // the rest is still there

        var nothing = AssertPng(Figures.MeanWithBands(new BandSeries("X", s.Time, nan, nan, nan, nan, nan, nan, [nan])), 900, 500);
        Assert.Equal(0, Count(nothing, Blue));
        Assert.Equal(0, Count(nothing, Vermillion));
    }

    [Fact]
    public void MeanWithBandsHandlesASingleTimePointAndAnEmptyGrid()
    {
        var one = new BandSeries("P", [2.0], [5.0], [3.0], [8.0], [5.5], [2.0], [9.0], [[6.0]]);
        var image = AssertPng(Figures.MeanWithBands(one), 900, 500);
        Assert.True(Count(image, Blue) > 20, "a single mean point is drawn as a marker");

        AssertPng(Figures.MeanWithBands(new BandSeries("P", [], [], [], [], [], null, null, [])), 900, 500);
    }

    [Fact]
    public void MisalignedArraysAndBadSizesAreReportedByName()
    {
        var s = Band();
        var e = Assert.Throws<ReportException>(() => Figures.MeanWithBands(s with { Mean = [1.0, 2.0] }));
        Assert.Contains("mRNA", e.Message);
        Assert.Contains("Mean", e.Message);
        e = Assert.Throws<ReportException>(() => Figures.MeanWithBands(s with { LnaUpper = null }));
        Assert.Contains("LnaLower", e.Message);
        e = Assert.Throws<ReportException>(() => Figures.MeanWithBands(s with { SamplePaths = [new double[3]] }));
        Assert.Contains("sample path 1", e.Message);
        e = Assert.Throws<ReportException>(() => Figures.MeanWithBands(s, 10, 500));
        Assert.Contains("pixels", e.Message);
    }

    // --- histograms ------------------------------------------------------------------------------

    /// <summary>Poisson(λ) probabilities, the stationary law of immigration–death (Gardiner 2009, Stochastic Methods, §11.1; quoted from memory).</summary>
    private static HistogramSnapshot Poisson(double time, double lambda, double rateEquation)
    {
        long[] counts = Enumerable.Range(0, 60).Select(k => (long)k).ToArray();
        double[] p = counts.Select(k => Math.Exp(k * Math.Log(lambda) - lambda - LogFactorial(k))).ToArray();
        return new HistogramSnapshot("mRNA", time, counts, p, rateEquation, "min");
    }

    private static double LogFactorial(long k)
    {
        double s = 0;
        for (long i = 2; i <= k; i++) s += Math.Log(i);
        return s;
    }

    [Fact]
    public void HistogramsRenderOnePanelPerSnapshotWithTheRateEquationLine()
    {
        var image = AssertPng(Figures.Histograms([Poisson(1, 4, 4), Poisson(5, 15, 15), Poisson(20, 30, 30), Poisson(50, 38, 38)], 1000, 700), 1000, 700);
        Assert.True(Count(image, Vermillion) > 4 * 100, "each panel has its rate-equation line");
    }

    [Fact]
    public void HistogramsSkipNaNProbabilitiesAndDrawNoLineForANaNRateEquation()
    {
        var snap = Poisson(5, 15, double.NaN);
        double[] p = (double[])snap.Probabilities.Clone();
        p[15] = double.NaN;
        var image = AssertPng(Figures.Histograms([snap with { Probabilities = p }]), 900, 500);
        Assert.Equal(0, Count(image, Vermillion));

        var allNaN = snap with { Probabilities = Enumerable.Repeat(double.NaN, p.Length).ToArray() };
        AssertPng(Figures.Histograms([allNaN]), 900, 500);
    }

    [Fact]
    public void HistogramsHandleASingleCountAndNoSnapshots()
    {
        var image = AssertPng(Figures.Histograms([new HistogramSnapshot("P", 0, [7], [1.0], 7)]), 900, 500);
        Assert.True(Count(image, Vermillion) > 100);
        AssertPng(Figures.Histograms([]), 900, 500);
        AssertPng(Figures.Histograms([new HistogramSnapshot("P", 0, [], [], double.NaN)]), 900, 500);

        var e = Assert.Throws<ReportException>(() => Figures.Histograms([new HistogramSnapshot("P", 0, [1, 2], [1.0], 1)]));
        Assert.Contains("Probabilities", e.Message);
    }

    // --- heat map --------------------------------------------------------------------------------

    // Top of the viridis colour map, #FDE725 (Smith & van der Walt 2015; quoted from memory); ScottPlot's
    // table gives (253, 231, 36), inside the tolerance.
    private static int ViridisTop(PngDecoder image) => image.CountNear(0xFD, 0xE7, 0x25, tolerance: 3);

    [Fact]
    public void HeatmapRendersEvenAndUnevenGridsWithNaNCells()
    {
        double[] t = Enumerable.Range(0, 40).Select(i => 0.5 * i).ToArray();
        var p = new double[t.Length, 31];
        for (int i = 0; i < t.Length; i++) p[i, Math.Min(30, i)] = 1.0; // all mass on one count
        p[3, 3] = double.NaN;
        var image = AssertPng(Figures.Heatmap(new DistributionHeatmap("A", t, 0, 30, p, t.Select(x => 2 * x).ToArray(), "s")), 900, 500);
        Assert.True(ViridisTop(image) > 1000, "cells of probability 1 take the top colour");

        double[] uneven = [0, 0.1, 0.5, 2, 2.2, 10];
        var q = new double[uneven.Length, 5];
        for (int i = 0; i < uneven.Length; i++) q[i, i % 5] = 0.5;
        AssertPng(Figures.Heatmap(new DistributionHeatmap("A", uneven, 10, 14, q)), 900, 500);
    }

    /// <summary>
    /// Issue 16: a point mass at t = 0 followed by a bimodal law (two equal modes at 8 and 32 copies, each a
    /// discretised normal of s.d. 2, so each peak cell holds about 0.5 / (2·√(2π)) ≈ 0.1). On one scale for the
    /// whole map the ridges sit at a tenth of the top and are near-black; per time they take the top colour.
    /// Checked by pixel statistics along the count axis: an image column well after t = 0 crosses exactly two
    /// separate runs of the top colour, one per mode, with the lower one below the upper one.
    /// </summary>
    [Fact]
    public void HeatmapShowsABimodalLawAsTwoBrightRidgesAfterAPointMassAtTheStart()
    {
        double[] t = Enumerable.Range(0, 21).Select(i => (double)i).ToArray();
        const int maxCount = 40;
        var p = new double[t.Length, maxCount + 1];
        p[0, 20] = 1.0;
        for (int i = 1; i < t.Length; i++)
        {
            double total = 0;
            for (int k = 0; k <= maxCount; k++)
                total += p[i, k] = Math.Exp(-(k - 8) * (k - 8) / 8.0) + Math.Exp(-(k - 32) * (k - 32) / 8.0);
            for (int k = 0; k <= maxCount; k++) p[i, k] /= total;
        }
        var image = AssertPng(Figures.Heatmap(new DistributionHeatmap("U", t, 0, maxCount, p)), 900, 500);

        foreach (var x in new[] { 300, 450, 600 })
        {
            var runs = new List<(int Start, int End)>();
            for (int y = 0; y < image.Height; y++)
            {
                var (r, g, b) = image.At(x, y);
                bool top = Math.Abs(r - 0xFD) <= 3 && Math.Abs(g - 0xE7) <= 3 && Math.Abs(b - 0x25) <= 3;
                if (!top) continue;
                if (runs.Count > 0 && runs[^1].End == y - 1) runs[^1] = (runs[^1].Start, y);
                else runs.Add((y, y));
            }
            Assert.True(runs.Count == 2, $"column x = {x}: {runs.Count} bright runs ({string.Join(", ", runs)}), expected one per mode");
            // The modes are 24 of 41 count rows apart: the dark gap between them is far taller than either ridge.
            Assert.True(runs[1].Start - runs[0].End > 5 * (runs[0].End - runs[0].Start + 1), $"column x = {x}: ridges {runs[0]} and {runs[1]} are not separated");
        }
    }

    [Fact]
    public void HeatmapOfASingleCellFillsTheMapAndAnAllNaNMapDrawsNone()
    {
        var single = AssertPng(Figures.Heatmap(new DistributionHeatmap("P", [3.0], 5, 5, new double[,] { { 1.0 } })), 900, 500);
        Assert.True(ViridisTop(single) > 100_000, "the one cell covers the data area");

        var nan = new double[4, 3];
        for (int i = 0; i < 4; i++) for (int k = 0; k < 3; k++) nan[i, k] = double.NaN;
        var none = AssertPng(Figures.Heatmap(new DistributionHeatmap("P", [0, 1, 2, 3], 0, 2, nan)), 900, 500);
        Assert.Equal(0, ViridisTop(none)); // no cells, hence no colour bar either

        AssertPng(Figures.Heatmap(new DistributionHeatmap("P", [], 0, 0, new double[0, 1])), 900, 500);
    }

    [Fact]
    public void HeatmapRejectsAProbabilityArrayOfTheWrongShape()
    {
        var e = Assert.Throws<ReportException>(() => Figures.Heatmap(new DistributionHeatmap("P", [0, 1], 0, 4, new double[2, 4])));
        Assert.Contains("2 (times) × 5", e.Message);
        e = Assert.Throws<ReportException>(() => Figures.Heatmap(new DistributionHeatmap("P", [1, 0], 0, 0, new double[2, 1])));
        Assert.Contains("increase", e.Message);
    }

    [Fact]
    public void UnevenTimesOwnTheIntervalBetweenNeighbouringMidpoints()
    {
        // Times 0, 1, 3: cell edges at −0.5, 0.5, 2, 4 (midpoints, ends extended by half a step); the
        // narrowest cell is 1 wide over a span of 4.5, so 4 equal columns of 1.125 with centres
        // 0.0625, 1.1875, 2.3125, 3.4375 fall in cells 0, 1, 2, 2 (worked by hand).
        var (columns, left, right) = HeatmapFigure.Columns([0, 1, 3]);
        Assert.Equal([0, 1, 2, 2], columns);
        Assert.Equal(-0.5, left, 12);
        Assert.Equal(4.0, right, 12);

        // An even grid maps one column to each time.
        Assert.Equal([0, 1, 2, 3], HeatmapFigure.Columns([10, 20, 30, 40]).ColumnOf);
    }

    // --- sweep -----------------------------------------------------------------------------------

    [Fact]
    public void SweepRendersOnLogAxesSkippingUnresolvedZeroAndNegativeDeviations()
    {
        double[] sizes = [1, 3, 10, 30, 100, 300, 1000];
        var series = new[]
        {
            new SweepSeries("A", sizes, [double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN], new double[7]),
            new SweepSeries("B", sizes, sizes.Select(o => 0.4 / o).ToArray(), sizes.Select(o => 0.05 / o).ToArray()),
            new SweepSeries("C", sizes, [0.5, 0, -0.1, double.NaN, 0.004, double.PositiveInfinity, 0.0003], [0.6, 0.1, 0.1, double.NaN, 0.001, 1, double.NaN]),
        };
        var image = AssertPng(Figures.SweepLogLog(series), 900, 500);
        Assert.Equal(0, Count(image, Blue));               // series A (first colour) has nothing to draw
        Assert.True(Count(image, Vermillion) > 200);       // series B (second colour) is drawn
    }

    [Fact]
    public void SweepHandlesASinglePointAndNoSeries()
    {
        var image = AssertPng(Figures.SweepLogLog([new SweepSeries("A", [50], [0.004], [0.001])]), 900, 500);
        Assert.True(Count(image, Blue) > 50);
        AssertPng(Figures.SweepLogLog([]), 900, 500);
        AssertPng(Figures.SweepLogLog([new SweepSeries("A", [], [], [])], 400, 300), 400, 300);
    }

    [Fact]
    public void DecadeTicksAreLabelledAsPowersOfTen()
    {
        // Definition of decade ticks on a log10 axis (common practice).
        Assert.Equal("10⁻³", LogTicks.PowerOfTen(-3));
        Assert.Equal("10¹²", LogTicks.PowerOfTen(12));
        Assert.Equal("10⁰", LogTicks.PowerOfTen(0));

        var ticks = LogTicks.Ticks(0, 3);
        Assert.Equal([0.0, 1, 2, 3], ticks.Where(t => t.IsMajor).Select(t => t.Position));
        Assert.Equal(["10⁰", "10¹", "10²", "10³"], ticks.Where(t => t.IsMajor).Select(t => t.Label));
        Assert.Equal(3 * 8, ticks.Count(t => !t.IsMajor)); // 2…9 × 10ⁿ in each of three decades

        // Inside one decade, 2 × and 5 × are labelled: log10(20) and log10(50).
        var narrow = LogTicks.Ticks(1.1, 1.9).Where(t => t.IsMajor).ToArray();
        Assert.Equal(["2×10¹", "5×10¹"], narrow.Select(t => t.Label));
        Assert.Equal(Math.Log10(20), narrow[0].Position, 12);
        Assert.Equal(Math.Log10(50), narrow[1].Position, 12);
    }
}
