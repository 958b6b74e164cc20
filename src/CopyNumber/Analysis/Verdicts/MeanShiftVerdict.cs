using MathNet.Numerics.Distributions;
using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// "mean shifted": the hypothesis that the mean departs from the rate equations by more than the relative
/// threshold θ, tested at every eligible grid time with a family-wise false-alarm rate α over the grid.
/// </summary>
/// <remarks>
/// At grid time k the null hypothesis is H₀ₖ: |E[x] − φ| ≤ θ|φ| (a deviation within the threshold), the
/// statistic uₖ = (|d| − θ|φ|)/SE and the p-value pₖ = min(1, 2·Φ̄(uₖ)): at the least favourable points
/// E[x] − φ = ±θ|φ| the chance that |d| − θ|φ| exceeds u·SE is at most Φ̄(u) + Φ̄(u + 2θ|φ|/SE) ≤ 2Φ̄(u).
/// A time is flagged by Holm's step-down procedure over the m eligible times (Holm 1979, Scand. J. Stat.
/// 6:65): sort the p-values, reject while p₍ᵢ₎ ≤ α/(m − i + 1). Holm holds the family-wise rate at α under
/// any dependence between grid times, which here is strong and positive. A time is eligible where
/// |φ| ≥ the deterministic floor and the sample mean is near normal by Cochran's rule (<see cref="SampleShape"/>).
/// The interval printed is the Bonferroni simultaneous band d ± z·SE, z = Φ⁻¹(1 − α/(2m)).
/// </remarks>
internal sealed record MeanShiftTest(int[] Eligible, int[] Flagged, int TooSkewed, double BandZ)
{
    public static MeanShiftTest Run(IReadOnlyList<ContrastPoint> points, IReadOnlyList<MeanDeviation> deviations, IReadOnlyList<SampleShape> shapes, ContrastThresholds t)
    {
        var aboveFloor = Enumerable.Range(0, points.Count).Where(k => !double.IsNaN(deviations[k].Relative)).ToArray();
        var eligible = aboveFloor.Where(k => shapes[k].MeanIsNearNormal(points[k].Replicates)).ToArray();
        var m = eligible.Length;
        var bandZ = m == 0 ? double.NaN : Normal.InvCDF(0, 1, 1 - t.FalseAlarmRate / (2.0 * m));
        var pValues = eligible.Select(k => PValue(points[k], deviations[k].Absolute, t.RelativeDeviation)).ToArray();
        var order = Enumerable.Range(0, m).OrderBy(i => pValues[i]).ToArray();
        var flagged = new List<int>();
        for (var i = 0; i < m; i++)
        {
            if (!(pValues[order[i]] <= t.FalseAlarmRate / (m - i))) break;
            flagged.Add(eligible[order[i]]);
        }
        flagged.Sort();
        return new MeanShiftTest(eligible, flagged.ToArray(), aboveFloor.Length - m, bandZ);
    }

    private static double PValue(ContrastPoint p, double deviation, double threshold)
    {
        var excess = Math.Abs(deviation) - threshold * Math.Abs(p.RateEquationValue);
        if (!(p.StandardError > 0))
            // Every replicate agrees: the deviation is exact, up to the rate equations' round-off.
            return excess > RelativeRoundOff * Math.Max(1, Math.Abs(p.RateEquationValue)) ? 0 : 1;
        return Math.Min(1, 2 * Normal.CDF(0, 1, -excess / p.StandardError));
    }

    /// <summary>Half-width of the simultaneous band of the relative deviation at grid time k.</summary>
    public double RelativeBand(ContrastPoint p) => BandZ * p.StandardError / Math.Abs(p.RateEquationValue);

    /// <summary>The eligible time whose relative deviation the simultaneous band resolves from 0 by the most, or −1.</summary>
    public int LargestResolved(IReadOnlyList<ContrastPoint> points, IReadOnlyList<MeanDeviation> deviations) =>
        Eligible.Where(k => Math.Abs(deviations[k].Relative) > Math.Max(RelativeBand(points[k]), RelativeRoundOff))
            .DefaultIfEmpty(-1).MaxBy(k => k < 0 ? 0 : Math.Abs(deviations[k].Relative));

    /// <summary>The verdict, or null when no grid time is flagged.</summary>
    public QuantityVerdict? Verdict(string quantity, IReadOnlyList<ContrastPoint> points, IReadOnlyList<MeanDeviation> deviations, ContrastThresholds t)
    {
        if (Flagged.Length == 0) return null;
        var top = Flagged.MaxBy(k => Math.Abs(deviations[k].Relative));
        var d = deviations[top];
        var p = points[top];
        var scale = Math.Abs(p.RateEquationValue);
        var half = RelativeBand(p);
        var magnitude = Math.Abs(d.Relative);
        var direction = d.Relative > 0 ? "above" : "below";
        var first = Flagged[0];
        var tail = Eligible.SkipWhile(k => k < first).ToArray();
        string when;
        if (Flagged.Length == 1) when = $"at t = {Time(p.Time)}";
        else if (tail.Length == Flagged.Length) when = $"from t = {Time(points[first].Time)} on";
        else when = $"at {Flagged.Length} of {Count(Eligible.Length, "grid time", "grid times")} between t = {Time(points[first].Time)} and t = {Time(points[Flagged[^1]].Time)}";
        var prediction = double.IsNaN(p.CorrectedMean) ? ""
            : $", where the first-order correction predicts {SignedPercent((p.CorrectedMean - p.RateEquationValue) / scale, half)}";
        var extent = Flagged.Length == 1 ? "" : "up to ";
        var skipped = TooSkewed == 0 ? "" : $"; {Count(TooSkewed, "grid time", "grid times")} not judged, too skewed for a normal mean (n ≤ 25·skewness²)";
        return new QuantityVerdict(quantity, VerdictKind.MeanShifted,
            $"ensemble mean {extent}{Percent(magnitude, half)} (simultaneous interval {Percent(Math.Max(magnitude - half, 0))} to {Percent(magnitude + half)}) {direction} the rate equations "
            + $"(t = {Time(p.Time)}: {Number(p.Mean, p.StandardError)} against {Number(p.RateEquationValue)}{prediction}), beyond {Percent(t.RelativeDeviation)} {when}; "
            + $"threshold {Percent(t.RelativeDeviation)}, false-alarm rate {Percent(t.FalseAlarmRate)} over {Count(Eligible.Length, "grid time", "grid times")} (Holm){skipped}");
    }
}
