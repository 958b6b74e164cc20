using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Analysis;

/// <summary>
/// Contrasts a quantity's stochastic ensemble with its rate equations (and, when given, the linear
/// noise approximation and the first-order corrected mean) on the time grid, and draws verdicts with
/// the thresholds of <see cref="ContrastThresholds"/>. docs/methods-analysis.md states every rule.
/// </summary>
public static partial class Contrast
{
    /// <summary>The caution every report of verdicts should carry.</summary>
    public const string Caution =
        "These verdicts compare the stochastic model with its own rate equations: they describe the model, not the cell, "
        + "and hold only for the parameter values, system size and initial counts simulated.";

    /// <summary>Contrasts one quantity over the grid.</summary>
    /// <param name="quantity">The species or readout name, used in the verdicts.</param>
    /// <param name="points">One point per grid time, times strictly increasing.</param>
    /// <param name="thresholds">The thresholds; <see cref="ContrastThresholds.Default"/> when null.</param>
    /// <param name="lattice">The quantity's lattice from the model, on which its histograms are read; the plain integers when null.</param>
    /// <exception cref="AnalysisInputException">No points, times not increasing or not finite, a replicate count below 1, or a threshold out of range.</exception>
    public static QuantityContrast Analyze(string quantity, IReadOnlyList<ContrastPoint> points, ContrastThresholds? thresholds = null, QuantityLattice? lattice = null)
    {
        ArgumentNullException.ThrowIfNull(quantity);
        ArgumentNullException.ThrowIfNull(points);
        thresholds ??= ContrastThresholds.Default;
        thresholds.Validate();
        Check(quantity, points);

        var count = points.Count;
        var z = thresholds.Z;
        var deviations = new MeanDeviation[count];
        var resolved = new bool[count];
        var fromCorrected = new double[count];
        var varianceRatio = new double[count];
        var cv = new double[count];
        var fano = new double[count];
        var modes = CountModes(points, thresholds.ModeRule, lattice);
        for (var k = 0; k < count; k++)
        {
            var p = points[k];
            var absolute = p.Mean - p.RateEquationValue;
            var halfWidth = z * p.StandardError;
            var scale = Math.Abs(p.RateEquationValue);
            var aboveFloor = scale >= thresholds.DeterministicFloor && scale > 0;
            deviations[k] = new MeanDeviation(p.Time, absolute, halfWidth,
                aboveFloor ? absolute / scale : double.NaN, aboveFloor ? halfWidth / scale : double.NaN);
            // A deviation at round-off level (a conserved readout with zero variance) is not a deviation.
            resolved[k] = Math.Abs(absolute) > halfWidth && Math.Abs(absolute) > 1e-9 * Math.Max(1.0, scale);
            fromCorrected[k] = p.Mean - p.CorrectedMean;
            varianceRatio[k] = p.LnaVariance > 0 ? p.Variance / p.LnaVariance : double.NaN;
            cv[k] = p.Mean > 0 ? Math.Sqrt(Math.Max(p.Variance, 0)) / p.Mean : double.NaN;
            fano[k] = p.Mean > 0 ? p.Variance / p.Mean : double.NaN;
        }

        MeanDeviation? largest = null, largestRelative = null;
        for (var k = 0; k < count; k++)
        {
            if (!resolved[k]) continue;
            var d = deviations[k];
            if (largest is null || Math.Abs(d.Absolute) > Math.Abs(largest.Absolute)) largest = d;
            if (!double.IsNaN(d.Relative) && (largestRelative is null || Math.Abs(d.Relative) > Math.Abs(largestRelative.Relative))) largestRelative = d;
        }

        var minimumReplicates = points.Min(p => p.Replicates);
        var context = new Evidence(quantity, points, thresholds, deviations, resolved, cv, modes);
        var verdicts = new List<QuantityVerdict>();
        if (minimumReplicates < thresholds.MinimumReplicates)
            verdicts.Add(TooFewReplicates(context, minimumReplicates));
        else
        {
            if (MeanShifted(context) is { } shifted) verdicts.Add(shifted);
            if (NoiseDominated(context) is { } noisy) verdicts.Add(noisy);
            if (Multimodal(context) is { } multimodal) verdicts.Add(multimodal);
            if (ExtinctionProne(context) is { } extinction) verdicts.Add(extinction);
            if (verdicts.Count == 0) verdicts.Add(Adequate(context, largestRelative ?? largest));
        }

        return new QuantityContrast(quantity)
        {
            Times = points.Select(p => p.Time).ToArray(),
            Deviations = deviations,
            Resolved = resolved,
            DeviationFromCorrectedMean = fromCorrected,
            VarianceRatio = varianceRatio,
            CoefficientOfVariation = cv,
            FanoFactor = fano,
            Modes = modes,
            MultimodalTimes = Enumerable.Range(0, count).Where(k => modes[k] is { Count: > 1 }).Select(k => points[k].Time).ToArray(),
            LargestResolvedDeviation = largest,
            LargestResolvedRelativeDeviation = largestRelative,
            FinalProbabilityOfZero = points[^1].ProbabilityOfZero,
            MinimumReplicates = minimumReplicates,
            Verdicts = verdicts,
        };
    }

    private sealed record Evidence(
        string Quantity, IReadOnlyList<ContrastPoint> Points, ContrastThresholds Thresholds,
        MeanDeviation[] Deviations, bool[] Resolved, double[] CoefficientOfVariation, ModeCountResult?[] Modes);

    private static void Check(string quantity, IReadOnlyList<ContrastPoint> points)
    {
        if (points.Count == 0) throw new AnalysisInputException($"no grid times were given for {quantity}");
        for (var k = 0; k < points.Count; k++)
        {
            var p = points[k] ?? throw new AnalysisInputException($"grid point {k} of {quantity} is missing");
            if (!double.IsFinite(p.Time)) throw new AnalysisInputException($"grid point {k} of {quantity} has the time {p.Time}");
            if (k > 0 && !(p.Time > points[k - 1].Time))
                throw new AnalysisInputException($"the grid times of {quantity} must increase, but {Time(p.Time)} follows {Time(points[k - 1].Time)}");
            if (p.Replicates < 1) throw new AnalysisInputException($"{quantity} at t = {Time(p.Time)} summarises {p.Replicates} replicates; at least 1 is needed");
        }
    }

    // Resolved (|dev| > z·SE) and beyond the relative threshold, where the rate equations are above the floor.
    private static QuantityVerdict? MeanShifted(Evidence e)
    {
        var t = e.Thresholds;
        var eligible = Enumerable.Range(0, e.Points.Count).Where(k => !double.IsNaN(e.Deviations[k].Relative)).ToArray();
        var flagged = eligible.Where(k => e.Resolved[k] && Math.Abs(e.Deviations[k].Relative) > t.RelativeDeviation).ToArray();
        if (flagged.Length == 0) return null;
        var top = flagged.MaxBy(k => Math.Abs(e.Deviations[k].Relative));
        var d = e.Deviations[top];
        var p = e.Points[top];
        var direction = d.Relative > 0 ? "above" : "below";
        var first = flagged[0];
        var tail = eligible.SkipWhile(k => k < first).ToArray();
        string when;
        if (flagged.Length == 1) when = $"at t = {Time(p.Time)}";
        else if (tail.Length == flagged.Length) when = $"from t = {Time(e.Points[first].Time)} on";
        else when = $"at {flagged.Length} of {eligible.Length} grid times between t = {Time(e.Points[first].Time)} and t = {Time(e.Points[flagged[^1]].Time)}";
        var prediction = double.IsNaN(p.CorrectedMean) ? ""
            : $", where the first-order correction predicts {Signed((p.CorrectedMean - p.RateEquationValue) / Math.Abs(p.RateEquationValue))}";
        var extent = flagged.Length == 1 ? "" : "up to ";
        return new QuantityVerdict(e.Quantity, VerdictKind.MeanShifted,
            $"ensemble mean {extent}{Percent(Math.Abs(d.Relative))} (±{Percent(d.RelativeHalfWidth)}) {direction} the rate equations "
            + $"(t = {Time(p.Time)}: {Number(p.Mean)} against {Number(p.RateEquationValue)}{prediction}), beyond {Percent(t.RelativeDeviation)} {when}; "
            + $"threshold {Percent(t.RelativeDeviation)}");
    }

    // The median CV over the late window, so one noisy point neither makes nor spoils the verdict.
    private static QuantityVerdict? NoiseDominated(Evidence e)
    {
        var t = e.Thresholds;
        var (window, start) = LateWindow(e);
        var values = window.Select(k => e.CoefficientOfVariation[k]).Where(double.IsFinite).Order().ToArray();
        if (values.Length == 0) return null;
        var median = values.Length % 2 == 1 ? values[values.Length / 2] : 0.5 * (values[values.Length / 2 - 1] + values[values.Length / 2]);
        if (!(median > t.CoefficientOfVariation)) return null;
        var last = e.Points[^1];
        var final = e.CoefficientOfVariation[^1];
        var lna = last.LnaVariance >= 0 && last.RateEquationValue > 0
            ? $"; the linear noise approximation gives {Number(Math.Sqrt(last.LnaVariance) / last.RateEquationValue)}" : "";
        return new QuantityVerdict(e.Quantity, VerdictKind.NoiseDominated,
            $"coefficient of variation {Number(median)} over the last {Percent(t.LateFraction)} of the run (median of {values.Length} grid times from t = {Time(start)}; "
            + $"{Number(final)} at the final time t = {Time(last.Time)}{lna}); threshold {Number(t.CoefficientOfVariation)}");
    }

    private static (int[] Indices, double Start) LateWindow(Evidence e)
    {
        var first = e.Points[0].Time;
        var last = e.Points[^1].Time;
        var from = last - e.Thresholds.LateFraction * (last - first);
        var indices = Enumerable.Range(0, e.Points.Count).Where(k => e.Points[k].Time >= from).ToArray();
        return (indices, e.Points[indices[0]].Time);
    }

    private static QuantityVerdict? ExtinctionProne(Evidence e)
    {
        var t = e.Thresholds;
        var last = e.Points[^1];
        if (!(last.ProbabilityOfZero >= t.ExtinctionProbability) || !(last.RateEquationValue >= t.ExtinctionFloor)) return null;
        return new QuantityVerdict(e.Quantity, VerdictKind.ExtinctionProne,
            $"P(0) = {Number(last.ProbabilityOfZero)} at the final time t = {Time(last.Time)} while the rate equations hold {Number(last.RateEquationValue)} copies; "
            + $"threshold P(0) ≥ {Number(t.ExtinctionProbability)} with the rate equations at ≥ {Number(t.ExtinctionFloor)} {(t.ExtinctionFloor == 1 ? "copy" : "copies")}");
    }

    private static QuantityVerdict TooFewReplicates(Evidence e, long minimum)
    {
        var at = e.Points.First(p => p.Replicates == minimum);
        return new QuantityVerdict(e.Quantity, VerdictKind.TooFewReplicates,
            $"only {minimum} replicates at t = {Time(at.Time)}; at least {e.Thresholds.MinimumReplicates} are needed before any other verdict is drawn");
    }

    private static QuantityVerdict Adequate(Evidence e, MeanDeviation? largest)
    {
        var t = e.Thresholds;
        var deviation = largest is null
            ? $"no deviation from the rate equations is resolved at {Number(t.Z)} standard errors"
            : double.IsNaN(largest.Relative)
                ? $"largest resolved deviation from the rate equations {Signed(largest.Absolute, percent: false)} copies at t = {Time(largest.Time)}"
                : $"largest resolved deviation from the rate equations {Signed(largest.Relative)} (±{Percent(largest.RelativeHalfWidth)}) at t = {Time(largest.Time)}";
        var last = e.Points[^1];
        var cv = double.IsFinite(e.CoefficientOfVariation[^1]) ? $", coefficient of variation {Number(e.CoefficientOfVariation[^1])} at the end" : "";
        var modes = e.Modes[^1] is null ? "" : ", one mode";
        var zero = double.IsNaN(last.ProbabilityOfZero) ? "" : $", P(0) = {Number(last.ProbabilityOfZero)}";
        return new QuantityVerdict(e.Quantity, VerdictKind.Adequate,
            $"{deviation}{cv}{modes}{zero}; thresholds {Percent(t.RelativeDeviation)} deviation, coefficient of variation {Number(t.CoefficientOfVariation)}, "
            + $"P(0) {Number(t.ExtinctionProbability)}");
    }

    private static string Time(double t) => t.ToString("G6", CultureInfo.InvariantCulture);

    private static string Number(double x) => x.ToString(Math.Abs(x) >= 100 ? "F0" : "G3", CultureInfo.InvariantCulture);

    private static string Percent(double fraction)
    {
        var p = 100 * fraction;
        var text = Math.Abs(p) >= 10 ? p.ToString("F0", CultureInfo.InvariantCulture)
            : Math.Abs(p) >= 1 ? p.ToString("0.#", CultureInfo.InvariantCulture)
            : p.ToString("G2", CultureInfo.InvariantCulture);
        return text + "%";
    }

    private static string Signed(double value, bool percent = true)
    {
        var text = percent ? Percent(Math.Abs(value)) : Number(Math.Abs(value));
        return (value < 0 ? "−" : "+") + text;
    }
}
