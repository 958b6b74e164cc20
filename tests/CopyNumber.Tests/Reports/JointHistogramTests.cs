using CopyNumber.Reports;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// The joint histogram of two species (issue 16): a bimodal pair shows as two separate bright blobs, checked by pixel
/// statistics in the quadrants of the data area (the area read from the plot's layout); and simulate --pair writes
/// pair.parquet whose law at t = 0 is the model's initial state with probability 1 and whose fractions sum to 1 at every
/// time (the definition of a histogram; common practice).
/// </summary>
public sealed class JointHistogramTests
{
    // Viridis runs from #440154 to #FDE725 with its green channel rising monotonically (Smith & van der Walt 2015; quoted
    // from memory): green ≥ 160 is the upper part of the scale, above about 0.6 of the largest cell.
    private static bool Bright((byte R, byte G, byte B) c) => c.G >= 160;

    /// <summary>
    /// The toggle's two states of scenarios/toggle_pair.cnet, near (26, 4) and (4, 26) (its header), as two discretised
    /// normal blobs of s.d. 1.5 and weights 0.6 and 0.4: the brightest pixels lie in the upper-left and lower-right
    /// quadrants of the data area, and none in the other two.
    /// </summary>
    [Fact]
    public void ABimodalPairShowsAsTwoSeparateBrightBlobs()
    {
        var cells = new List<(long, long, double)>();
        for (long u = 0; u <= 32; u++)
            for (long v = 0; v <= 32; v++)
            {
                double p = 0.6 * Math.Exp(-((u - 26) * (u - 26) + (v - 4) * (v - 4)) / 4.5) + 0.4 * Math.Exp(-((u - 4) * (u - 4) + (v - 26) * (v - 26)) / 4.5);
                if (p > 1e-6) cells.Add((u, v, p));
            }
        double total = cells.Sum(c => c.Item3);
        var snapshot = new JointSnapshot("U", "V", 50, cells.Select(c => (c.Item1, c.Item2, c.Item3 / total)).ToArray(), 1000, "minute");
        var panels = JointHistogramFigure.Build([snapshot]);
        var image = PngDecoder.Decode(FigureLook.Render(panels, 1, 700, 600).Png);
        var data = panels[0].RenderManager.LastRender.DataRect;

        int midX = (int)data.HorizontalCenter, midY = (int)data.VerticalCenter;
        var quadrant = new int[2, 2]; // [right?, lower?]
        for (int x = (int)data.Left + 1; x < (int)data.Right - 1; x++)
            for (int y = (int)data.Top + 1; y < (int)data.Bottom - 1; y++)
                if (Bright(image.At(x, y))) quadrant[x > midX ? 1 : 0, y > midY ? 1 : 0]++;
        Assert.True(quadrant[1, 1] > 50, $"U high, V low (lower right): {quadrant[1, 1]} bright pixels");
        Assert.True(quadrant[0, 0] > 20, $"U low, V high (upper left): {quadrant[0, 0]} bright pixels");
        Assert.Equal(0, quadrant[0, 1]);
        Assert.Equal(0, quadrant[1, 0]);
    }

    [Fact]
    public void Simulate_with_pair_writes_the_joint_histogram_of_every_replicate()
    {
        using var scratch = new ScratchFolder();
        var folder = scratch.File("toggle");
        var run = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "10", "--every", "1", "--replicates", "200", "--seed", "11",
            "--pair", "U,V", "--at", "5,10", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);

        var table = ParquetReadBack.Of(Path.Combine(folder, "pair.parquet"));
        Assert.Equal(["time", "first", "first_count", "second", "second_count", "probability"], table.Names);
        var time = (double[])table.Values[0];
        var u = (long[])table.Values[2];
        var v = (long[])table.Values[4];
        var p = (double[])table.Values[5];
        // t = 0: the model's initial state U = 25, V = 2 in every replicate.
        var start = Enumerable.Range(0, time.Length).Where(i => time[i] == 0).ToArray();
        Assert.Equal((25L, 2L, 1.0), (u[start.Single()], v[start.Single()], p[start.Single()]));
        foreach (var group in Enumerable.Range(0, time.Length).GroupBy(i => time[i]))
            Assert.Equal(1.0, group.Sum(i => p[i]), 12);
        Assert.Equal(11, time.Distinct().Count());
        // Each fraction is a whole number of the 200 replicates.
        Assert.All(p, x => Assert.Equal(0, Math.Abs(x * 200 - Math.Round(x * 200)), 9));

        Assert.Contains("figures/U-V-joint.png", File.ReadAllText(Path.Combine(folder, "report.md")));
        Assert.True(File.Exists(Path.Combine(folder, "figures", "U-V-joint.svg")));
    }

    [Fact]
    public void A_pair_that_is_not_two_species_is_refused_before_the_run()
    {
        using var scratch = new ScratchFolder();
        var run = CliRun.Of("simulate", CliRun.Scenario("toggle_pair.cnet"), "--until", "1", "--every", "0.5", "--replicates", "10", "--pair", "U,total", "--out", scratch.File("x"));
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("--pair: 'total' is not a species of the model", run.Error);
        Assert.False(Directory.Exists(scratch.File("x")));
    }
}
