using CopyNumber.Analysis;
using CopyNumber.Ensembles;
using MathNet.Numerics.Distributions;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// Verdicts on synthetic ensembles drawn (fixed seeds, MathNet samplers) from laws whose answers are
/// known: the stationary immigration–death law is Poisson with mean α/μ (Bailey 1964, The Elements of
/// Stochastic Processes, ch. 7; quoted from memory), so its CV is 1/√mean and P(0) = e^(−mean).
/// </summary>
public sealed class ContrastTests
{
    private static ContrastPoint Point(Random random, double time, int replicates, Func<Random, long> draw,
        double rateEquation, double lnaVariance = double.NaN, double corrected = double.NaN)
    {
        var histogram = new CountHistogram();
        for (var i = 0; i < replicates; i++) histogram.Add(draw(random));
        return ContrastPoint.FromHistogram(time, DistributionSummary.From(histogram), histogram, rateEquation, lnaVariance, corrected);
    }

    // Grid 0, 1, …, 100; at t = 0 every replicate starts from the deterministic initial count.
    private static List<ContrastPoint> Series(int seed, int replicates, Func<double, Func<Random, long>> lawAt,
        Func<double, double> rateEquation, Func<double, double>? lna = null, Func<double, double>? corrected = null)
    {
        var random = new Random(seed);
        return Enumerable.Range(0, 101).Select(k => (double)k).Select(t =>
            Point(random, t, replicates, lawAt(t), rateEquation(t), lna?.Invoke(t) ?? double.NaN, corrected?.Invoke(t) ?? double.NaN)).ToList();
    }

    private static Func<Random, long> PoissonLaw(double mean) => r => mean == 0 ? 0 : Poisson.Sample(r, mean);

    [Fact]
    public void AQuantityThatIsOneInEveryReplicateIsNotCalledAZeroOneQuantity()
    {
        // A conserved total of one gene copy (g_off + g_on = 1) is the constant 1: its histogram holds only 1,
        // and an on/off statement with an occupancy would misdescribe it (common practice). A gene state that
        // takes both values is one.
        var constant = Series(4, 500, _ => _ => 1, _ => 1);
        Assert.DoesNotContain("0/1 quantity", Assert.Single(Contrast.Analyze("copies", constant).Verdicts).Sentence);
        var gene = Series(5, 500, t => t == 0 ? _ => 0 : r => r.NextDouble() < 0.5 ? 1 : 0, t => t == 0 ? 0 : 0.5);
        Assert.Contains(Contrast.Analyze("g_on", gene).Verdicts, v => v.Sentence.Contains("0/1 quantity (only 0 and 1 are seen"));
    }

    [Fact]
    public void ThousandsOfPoissonCopiesAreAdequateWithNoFalseAlarm()
    {
        // Immigration–death at stationarity with α/μ = 5000: ensemble mean, rate equations and LNA agree.
        var points = Series(1, 1000, _ => PoissonLaw(5000), _ => 5000, lna: _ => 5000);
        var contrast = Contrast.Analyze("A", points);
        var verdict = Assert.Single(contrast.Verdicts);
        Assert.Equal(VerdictKind.Adequate, verdict.Kind);
        Assert.Equal("adequate", verdict.Label);
        Assert.Contains("5%", verdict.Sentence);
        // Variance ratio ≈ 1: the sample variance of n Poisson draws has SE ≈ σ²·√(2/(n − 1)) (common practice).
        Assert.All(contrast.VarianceRatio, ratio => Assert.InRange(ratio, 1 - 5 * Math.Sqrt(2.0 / 999), 1 + 5 * Math.Sqrt(2.0 / 999)));
        Assert.All(contrast.CoefficientOfVariation, cv => Assert.InRange(cv, 0.8 / Math.Sqrt(5000), 1.2 / Math.Sqrt(5000)));
        Assert.All(contrast.Modes, m => Assert.Equal(1, m!.Count));
        Assert.Empty(contrast.MultimodalTimes);
        Assert.Equal(0.0, contrast.FinalProbabilityOfZero);
        Assert.Equal(1000, contrast.MinimumReplicates);
    }

    [Fact]
    public void TwoCopiesAreNoiseDominatedAndExtinctionProne()
    {
        // Poisson with mean 2: CV = 1/√2 ≈ 0.71 > 0.5 and P(0) = e^(−2) ≈ 0.135 ≥ 0.05, while the rate
        // equations hold 2 copies; the mean itself is right, so it is not shifted.
        var points = Series(2, 2000, _ => PoissonLaw(2), _ => 2, lna: _ => 2);
        var contrast = Contrast.Analyze("A", points);
        Assert.Equal([VerdictKind.NoiseDominated, VerdictKind.ExtinctionProne], contrast.Verdicts.Select(v => v.Kind));
        var pZeroSe = Math.Sqrt(Math.Exp(-2) * (1 - Math.Exp(-2)) / 2000);
        Assert.InRange(contrast.FinalProbabilityOfZero, Math.Exp(-2) - 5 * pZeroSe, Math.Exp(-2) + 5 * pZeroSe);
        var noisy = contrast.Verdicts[0].Sentence;
        Assert.Contains("threshold 0.5", noisy);
        Assert.Contains("linear noise approximation gives 0.707", noisy);
        var extinction = contrast.Verdicts[1].Sentence;
        Assert.Contains("threshold P(0) > 0.05 by an exact binomial test", extinction);
        Assert.Contains("rate equations hold 2 copies", extinction);
    }

    [Fact]
    public void BimodalHistogramIsMultimodal()
    {
        // ½·Poisson(5) + ½·Poisson(60) from t = 20 on (a switch), one Poisson(5) before; the rate equations
        // follow the ensemble mean, so only the shape is wrong.
        Func<Random, long> Mixture = r => Poisson.Sample(r, r.NextDouble() < 0.5 ? 5 : 60);
        var points = Series(3, 1000, t => t < 20 ? PoissonLaw(5) : Mixture, t => t < 20 ? 5 : 32.5);
        var contrast = Contrast.Analyze("A", points);
        var multimodal = Assert.Single(contrast.Verdicts, v => v.Kind == VerdictKind.Multimodal);
        Assert.DoesNotContain(contrast.Verdicts, v => v.Kind == VerdictKind.MeanShifted);
        Assert.Contains("2 modes at the final time t = 100", multimodal.Sentence);
        Assert.Equal(Enumerable.Range(20, 81).Select(t => (double)t), contrast.MultimodalTimes);
    }

    [Fact]
    public void TwentyReplicatesGiveOnlyTooFewReplicates()
    {
        // Two copies again (which would be noise-dominated and extinction-prone), but n = 20 < 100.
        var contrast = Contrast.Analyze("A", Series(4, 20, _ => PoissonLaw(2), _ => 2));
        var verdict = Assert.Single(contrast.Verdicts);
        Assert.Equal(VerdictKind.TooFewReplicates, verdict.Kind);
        Assert.Contains("only 20 replicates", verdict.Sentence);
        Assert.Contains("100", verdict.Sentence);
    }

    [Fact]
    public void ResolvedShiftIsReportedWithItsIntervalFromWhenItStarts()
    {
        // The rate equations stay at 100 while the ensemble follows Poisson(115) from t = 40 on: a 15% shift,
        // resolved since z·SE/100 = 3·√(115/1000)/100 ≈ 1%. The first-order correction (given) predicts 14%.
        var points = Series(5, 1000, t => PoissonLaw(t < 40 ? 100 : 115), _ => 100, corrected: t => t < 40 ? 100 : 114);
        var contrast = Contrast.Analyze("P", points);
        var shifted = Assert.Single(contrast.Verdicts, v => v.Kind == VerdictKind.MeanShifted);
        Assert.Contains("above the rate equations", shifted.Sentence);
        Assert.Contains("beyond 5% from t = 40 on", shifted.Sentence);
        Assert.Contains("first-order correction predicts +14%", shifted.Sentence);
        Assert.Contains("threshold 5%", shifted.Sentence);
        var se = Math.Sqrt(115.0 / 1000) / 100;
        var largest = contrast.LargestResolvedRelativeDeviation!;
        Assert.InRange(largest.Time, 40, 100);
        Assert.InRange(largest.Relative, 0.15 - 5 * se, 0.15 + 5 * se);
        Assert.Equal(3 * Math.Sqrt(points[(int)largest.Time].Variance / 1000) / 100, largest.RelativeHalfWidth, 1e-12);
        // Deviation from the corrected mean is ≈ 1 copy late in the run.
        Assert.InRange(contrast.DeviationFromCorrectedMean[^1], 1 - 5 * Math.Sqrt(0.115), 1 + 5 * Math.Sqrt(0.115));

        // A caller who only cares about shifts above 20% gets no shift verdict.
        var lenient = Contrast.Analyze("P", points, ContrastThresholds.Default with { RelativeDeviation = 0.2 });
        Assert.DoesNotContain(lenient.Verdicts, v => v.Kind == VerdictKind.MeanShifted);
    }

    [Fact]
    public void NonCountReadoutsHaveMomentsOnly()
    {
        // A readout that is not a count carries no histogram and no P(0): no mode count, no extinction verdict.
        var points = Enumerable.Range(0, 11).Select(k => new ContrastPoint(k, 500, 10.0, 1.0, Math.Sqrt(1.0 / 500), double.NaN, null, 10.0)).ToList();
        var contrast = Contrast.Analyze("ratio", points);
        Assert.All(contrast.Modes, Assert.Null);
        Assert.True(double.IsNaN(contrast.FinalProbabilityOfZero));
        Assert.Equal(VerdictKind.Adequate, Assert.Single(contrast.Verdicts).Kind);
        Assert.Contains("no deviation from the rate equations beyond 5% is resolved", contrast.Verdicts[0].Sentence);
    }

    [Fact]
    public void A_deviation_at_round_off_prints_as_zero_and_is_not_resolved()
    {
        // A conserved readout: every replicate holds exactly 100, the rate equations 100·(1 + 7.4·10⁻⁸), their
        // round-off (relative tolerance 10⁻⁶; common practice). No deviation, and no "−7.4E-06%".
        var points = Enumerable.Range(0, 11).Select(k => new ContrastPoint(k, 500, 100.0, 0.0, 0.0, double.NaN, null, 100.0 * (1 + 7.4e-8))).ToList();
        var contrast = Contrast.Analyze("total", points);
        var sentence = Assert.Single(contrast.Verdicts).Sentence;
        Assert.DoesNotContain("E-", sentence);
        Assert.Contains("none differs from 0 beyond the simultaneous band", sentence);
        Assert.All(contrast.Resolved, Assert.False);
    }

    [Fact]
    public void A_shift_exactly_at_the_threshold_is_not_flagged()
    {
        // Poisson(105) against rate equations at 100 (Bailey 1964 for the law), n = 1000: a 5% shift, resolved
        // from 0 (SE ≈ 0.32%) and with the point estimate beyond 5% at about half of the 101 grid times, but
        // "beyond 5%" is false (the boundary case, flagged in at most 1% of seeds); a 9% shift (12 SE beyond) is flagged.
        var near = Contrast.Analyze("P", Series(6, 1000, _ => PoissonLaw(105), _ => 100));
        Assert.DoesNotContain(near.Verdicts, v => v.Kind == VerdictKind.MeanShifted);
        var far = Contrast.Analyze("P", Series(6, 1000, _ => PoissonLaw(109), _ => 100));
        var shifted = Assert.Single(far.Verdicts, v => v.Kind == VerdictKind.MeanShifted);
        Assert.Contains("false-alarm rate 1% over 101 grid times (Holm)", shifted.Sentence);
    }

    [Fact]
    public void BadInputIsRejectedWithAMessage()
    {
        var p = new ContrastPoint(1, 500, 10, 1, 0.05, double.NaN, null, 10);
        var backwards = Assert.Throws<AnalysisInputException>(() => Contrast.Analyze("A", [p, p with { Time = 0.5 }]));
        Assert.Contains("must increase", backwards.Message);
        Assert.Throws<AnalysisInputException>(() => Contrast.Analyze("A", []));
        Assert.Throws<AnalysisInputException>(() => Contrast.Analyze("A", [p], ContrastThresholds.Default with { Z = 0 }));
        Assert.Contains("model, not the cell", Contrast.Caution);
    }
}
