using CopyNumber.Analysis;
using CopyNumber.Ensembles;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// Histograms that span billions of copies (runaway growth): the mode count bins them into a bounded
/// number of cells instead of expanding them copy by copy, and never fails for width.
/// </summary>
public sealed class WideRangeModeTests
{
    // Pure birth X -> 2X from 10 copies: X(t)·e^(−t) tends to a Gamma(10, 1) variable (Kendall 1948,
    // Ann. Math. Stat. 19:1; the Yule process; quoted from memory), so at t = 20 the counts spread over
    // ~10⁹–10¹⁰ copies. Drawn here as 10·e^t·Gamma(10, 1)/10 with a fixed seed.
    private static CountHistogram Yule(int seed, double time, int replicates)
    {
        var random = new Random(seed);
        var histogram = new CountHistogram();
        for (var i = 0; i < replicates; i++)
            histogram.Add((long)Math.Round(Math.Exp(time) * MathNet.Numerics.Distributions.Gamma.Sample(random, 10, 1)));
        return histogram;
    }

    [Fact]
    public void Billions_of_copies_are_counted_as_one_mode()
    {
        var result = ModeCount.Count(CountDistribution.FromHistogram(Yule(1, 20, 1000)));
        Assert.Equal(1, result.Count);
        // The Gamma(10, 1) mode is 9 (common practice: (shape − 1)·scale), so the mode lies near 9·e^20;
        // the smoothing and the sample blur it by about one standard deviation √10 of the Gamma law.
        Assert.InRange(result.Modes[0].Value, (9 - 2 * Math.Sqrt(10)) * Math.Exp(20), (9 + 2 * Math.Sqrt(10)) * Math.Exp(20));
    }

    [Fact]
    public void A_contrast_over_a_runaway_grid_draws_its_verdicts()
    {
        var points = Enumerable.Range(0, 21).Select(t =>
        {
            var histogram = Yule(100 + t, t, 100);
            return ContrastPoint.FromHistogram(t, DistributionSummary.From(histogram), histogram, 10 * Math.Exp(t));
        }).ToList();
        var contrast = Contrast.Analyze("X", points);
        Assert.All(contrast.Modes, m => Assert.Equal(1, m!.Count));
        Assert.DoesNotContain(contrast.Verdicts, v => v.Kind == VerdictKind.Multimodal);
    }
}
