using MathNet.Numerics.Distributions;
using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// "noise-dominated": the coefficient of variation exceeds the threshold c over the late window, judged on
/// its lower confidence bounds so that a CV near c does not flip from one seed to the next.
/// </summary>
/// <remarks>
/// At each late time k the CV estimate ĉ = s/x̄ has, by the delta method on (x̄, s²),
/// Var(ĉ) ≈ (ĉ²/n)·(ĉ² + (κ − 1)/4 − γ·ĉ) with γ the skewness and κ the kurtosis (plug-in from the
/// histogram; 0 and 3, the normal values, without one). Its lower bound is Lₖ = ĉ − z·SE(ĉ) with
/// z = Φ⁻¹(1 − α/2). The verdict fires when the median of Lₖ over the m late times exceeds c. If every true
/// CV is ≤ c, that needs at least m/2 of the bounds above their true value; by Markov's inequality the chance
/// is ≤ (m·α/2)/(m/2) = α, whatever the dependence between times. Times where the CV is not measurable
/// (<see cref="NoiseScale.Measurable"/>) are left out of the window.
/// </remarks>
internal static class NoiseVerdict
{
    public static QuantityVerdict? Judge(Contrast.Evidence e, int[] window, double windowStart)
    {
        var t = e.Thresholds;
        var z = Normal.InvCDF(0, 1, 1 - t.FalseAlarmRate / 2);
        var measured = window.Where(k => double.IsFinite(e.CoefficientOfVariation[k])).ToArray();
        if (measured.Length == 0) return null;
        var cvs = measured.Select(k => e.CoefficientOfVariation[k]).ToArray();
        var bounds = measured.Select(k => e.CoefficientOfVariation[k] - z * StandardError(e.Points[k], e.CoefficientOfVariation[k], e.Shapes[k])).ToArray();
        var bound = Median(bounds);
        if (!(bound > t.CoefficientOfVariation)) return null;
        var last = e.Points[^1];
        var final = e.CoefficientOfVariation[^1];
        var lna = last.LnaVariance >= 0 && last.RateEquationValue > 0
            ? $"; the linear noise approximation gives {Number(Math.Sqrt(last.LnaVariance) / last.RateEquationValue)}" : "";
        var atEnd = double.IsFinite(final) ? $"{Number(final)} at the final time t = {Time(last.Time)}" : $"none at the final time t = {Time(last.Time)}";
        return new QuantityVerdict(e.Quantity, VerdictKind.NoiseDominated,
            $"coefficient of variation {Number(Median(cvs))}, lower {Level(1 - t.FalseAlarmRate / 2)} confidence bound {Number(bound)}, over the last {Percent(t.LateFraction)} of the {e.Stretch} "
            + $"(medians of {Count(measured.Length, "grid time", "grid times")} from t = {Time(windowStart)}; {atEnd}{lna}); "
            + $"threshold {Number(t.CoefficientOfVariation)} for the bound, false-alarm rate {Percent(t.FalseAlarmRate)}");
    }

    /// <summary>The delta-method standard error of the coefficient of variation.</summary>
    public static double StandardError(ContrastPoint p, double cv, SampleShape shape)
    {
        var gamma = double.IsNaN(shape.Skewness) ? 0 : shape.Skewness;
        var kappa = double.IsNaN(shape.Kurtosis) ? 3 : shape.Kurtosis;
        var variance = cv * cv / p.Replicates * (cv * cv + (kappa - 1) / 4 - gamma * cv);
        return Math.Sqrt(Math.Max(variance, 0));
    }

    private static double Median(double[] values)
    {
        var sorted = values.Order().ToArray();
        var n = sorted.Length;
        return n % 2 == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
    }
}
