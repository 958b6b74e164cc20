using MathNet.Numerics.Distributions;
using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// "extinction-prone": at the final time P(0) exceeds the threshold p₀ while the rate equations hold at
/// least the floor. With X of the n replicates at 0, the exact binomial test of H₀: P(0) ≤ p₀ fires when
/// P(Binomial(n, p₀) ≥ X) ≤ α; equivalently the one-sided Clopper–Pearson lower bound (Clopper &amp;
/// Pearson 1934, Biometrika 26:404) of level 1 − α exceeds p₀. One test per quantity and run, so its
/// false-alarm rate is at most α (less, the law being discrete).
/// </summary>
internal static class ExtinctionVerdict
{
    public static QuantityVerdict? Judge(Contrast.Evidence e)
    {
        var t = e.Thresholds;
        var last = e.Points[^1];
        if (double.IsNaN(last.ProbabilityOfZero) || !(last.RateEquationValue >= t.ExtinctionFloor)) return null;
        var n = last.Replicates;
        var zeros = (long)Math.Round(last.ProbabilityOfZero * n);
        if (zeros == 0) return null;
        var tail = 1 - new Binomial(t.ExtinctionProbability, (int)Math.Min(n, int.MaxValue)).CumulativeDistribution(zeros - 1);
        if (!(tail <= t.FalseAlarmRate)) return null;
        var floor = $"with the rate equations at ≥ {Number(t.ExtinctionFloor)} {(t.ExtinctionFloor == 1 ? "copy" : "copies")}";
        // An exact law has no replicates: its P(0) is a probability with the projection's error bar, not a count of zeros.
        if (last.IsExactLaw)
            return new QuantityVerdict(e.Quantity, VerdictKind.ExtinctionProne,
                $"P(0) = {Number(last.ProbabilityOfZero)} in the exact law (master equation, no sampling error) at the final time t = {Time(last.Time)} "
                + $"while the rate equations hold {Number(last.RateEquationValue)} copies; threshold P(0) > {Number(t.ExtinctionProbability)}, {floor}");
        var lower = Beta.InvCDF(zeros, n - zeros + 1, t.FalseAlarmRate);
        return new QuantityVerdict(e.Quantity, VerdictKind.ExtinctionProne,
            $"P(0) = {Number(last.ProbabilityOfZero, 1.0 / n)} ({zeros} of {n} replicates at 0; lower {Level(1 - t.FalseAlarmRate)} confidence bound {Number(lower)}) at the final time t = {Time(last.Time)} "
            + $"while the rate equations hold {Number(last.RateEquationValue)} copies; "
            + $"threshold P(0) > {Number(t.ExtinctionProbability)} by an exact binomial test at false-alarm rate {Percent(t.FalseAlarmRate)}, "
            + floor);
    }
}
