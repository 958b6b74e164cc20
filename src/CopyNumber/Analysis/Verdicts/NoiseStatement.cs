using MathNet.Numerics.Distributions;
using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// What is said about the noise of a quantity for which no CV or Fano verdict is drawn, and why: a 0/1
/// quantity gets its occupancy (fraction of replicates at 1) with a Clopper–Pearson interval (Clopper &amp;
/// Pearson 1934, Biometrika 26:404) and, when known, its switching; a signed quantity its spread.
/// </summary>
internal static class NoiseStatement
{
    /// <summary>The clause, or null when the CV verdict applies (a positive quantity measurable in the late window).</summary>
    public static string? For(Contrast.Evidence e, int[] window)
    {
        var last = e.Points[^1];
        switch (e.Scale.Kind)
        {
            case NoiseScaleKind.ZeroOne:
                return $"a 0/1 quantity ({e.Scale.Source}): {Occupancy(last, e.Thresholds)}{Switching(last, e.Points[0].Time)}; "
                    + "no coefficient of variation or Fano factor verdict, since for a 0/1 quantity they are fixed by the occupancy p (CV = √((1 − p)/p), Fano factor 1 − p) and do not measure noise";
            case NoiseScaleKind.Signed:
                return $"the quantity {e.Scale.Source}: standard deviation {Number(Math.Sqrt(Math.Max(last.Variance, 0)))} around a mean of {Number(last.Mean, last.StandardError)} at the final time t = {Time(last.Time)}; "
                    + "no coefficient of variation or Fano factor verdict, since they need a positive quantity (a signed mean can be 0 whatever the noise)";
        }
        if (window.Any(k => double.IsFinite(e.CoefficientOfVariation[k]))) return null;
        return $"the mean is within {Number(e.Thresholds.Z)} standard errors of 0 at every grid time of the last {Percent(e.Thresholds.LateFraction)} of the {e.Stretch}: "
            + "no coefficient of variation or Fano factor verdict, since a ratio to an unresolved mean is not estimated";
    }

    private static string Occupancy(ContrastPoint p, ContrastThresholds t)
    {
        var n = p.Replicates;
        var ones = (long)Math.Round(p.Mean * n);
        var level = 1 - t.FalseAlarmRate;
        var low = ones == 0 ? 0 : Beta.InvCDF(ones, n - ones + 1, t.FalseAlarmRate / 2);
        var high = ones == n ? 1 : Beta.InvCDF(ones + 1, n - ones, 1 - t.FalseAlarmRate / 2);
        var deterministic = double.IsFinite(p.RateEquationValue) ? $", {Number(p.RateEquationValue)} by the rate equations" : "";
        if (p.IsExactLaw)
            return $"occupancy (probability of 1 in the exact law, no sampling error) {Number(p.Mean)} at the final time t = {Time(p.Time)}{deterministic}";
        return $"occupancy (fraction of replicates at 1) {Number(p.Mean, 1.0 / n)} at the final time t = {Time(p.Time)} ({Level(level)} interval {Number(low)} to {Number(high)}){deterministic}";
    }

    // The switches are counted per replicate at the events themselves (not from grid snapshots) by the caller.
    private static string Switching(ContrastPoint p, double start) =>
        double.IsNaN(p.SwitchesPerReplicate) ? ""
            : $", {Number(p.SwitchesPerReplicate)} switches per replicate from t = {Time(start)}"
              + (p.Time > start ? $" ({Number(p.SwitchesPerReplicate / (p.Time - start))} per time unit)" : "");
}
