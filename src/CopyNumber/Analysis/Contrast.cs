using System.Globalization;
using CopyNumber.Analysis.Phases;
using CopyNumber.Analysis.Verdicts;
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
    /// <param name="zeroOneLaw">When the model bounds this species to {0, 1} by a conservation law, that law written out
    /// (e.g. "g_off + g_on = 1"); null to decide from the histograms' support.</param>
    /// <param name="oscillation">The oscillation analysis of this quantity (docs/methods-analysis.md, section 7): on a limit cycle the
    /// mean-shift and noise verdicts give way to the oscillation verdict and extinction is judged against the cycle's trough; null without one.</param>
    /// <param name="phases">The phases of the run's schedule (<see cref="ModelPhase.Of"/>), indexed into <paramref name="points"/>; with more than one
    /// phase holding points, each phase is also judged on its own, at the false-alarm rate shared out over the phases
    /// (<see cref="QuantityContrast.Phases"/>). Null or one phase: no per-phase verdicts.</param>
    /// <exception cref="AnalysisInputException">No points, times not increasing or not finite, a replicate count below 1, or a threshold out of range.</exception>
    public static QuantityContrast Analyze(string quantity, IReadOnlyList<ContrastPoint> points, ContrastThresholds? thresholds = null, QuantityLattice? lattice = null, string? zeroOneLaw = null,
        QuantityOscillation? oscillation = null, IReadOnlyList<ModelPhase>? phases = null)
    {
        var contrast = Judge(quantity, points, thresholds, lattice, zeroOneLaw, oscillation, "run");
        if (phases is not null) contrast.Phases = PerPhase(quantity, points, thresholds ?? ContrastThresholds.Default, lattice, zeroOneLaw, oscillation, phases);
        return contrast;
    }

    // The verdicts over one stretch of grid times: the whole run, or one phase of it.
    private static QuantityContrast Judge(string quantity, IReadOnlyList<ContrastPoint> points, ContrastThresholds? thresholds, QuantityLattice? lattice, string? zeroOneLaw,
        QuantityOscillation? oscillation, string stretch)
    {
        ArgumentNullException.ThrowIfNull(quantity);
        ArgumentNullException.ThrowIfNull(points);
        thresholds ??= ContrastThresholds.Default;
        thresholds.Validate();
        Check(quantity, points);

        var count = points.Count;
        var z = thresholds.Z;
        var scale = NoiseScale.Of(points, zeroOneLaw);
        var deviations = new MeanDeviation[count];
        var resolved = new bool[count];
        var fromCorrected = new double[count];
        var varianceRatio = new double[count];
        var cv = new double[count];
        var fano = new double[count];
        var modes = CountModes(points, thresholds.ModeRule, lattice);
        var shapes = new SampleShape[count];
        for (var k = 0; k < count; k++)
        {
            var p = points[k];
            var absolute = p.Mean - p.RateEquationValue;
            var halfWidth = z * p.StandardError;
            var size = Math.Abs(p.RateEquationValue);
            var aboveFloor = size >= thresholds.DeterministicFloor && size > 0;
            deviations[k] = new MeanDeviation(p.Time, absolute, halfWidth,
                aboveFloor ? absolute / size : double.NaN, aboveFloor ? halfWidth / size : double.NaN);
            // Pointwise and descriptive (contrast.parquet); the verdicts use family-wise rules. A deviation within
            // the rate equations' round-off (a conserved readout with zero variance) is not a deviation.
            resolved[k] = Math.Abs(absolute) > halfWidth && Math.Abs(absolute) > VerdictText.RelativeRoundOff * Math.Max(1.0, size);
            fromCorrected[k] = p.Mean - p.CorrectedMean;
            varianceRatio[k] = p.LnaVariance > 0 ? p.Variance / p.LnaVariance : double.NaN;
            var measurable = scale.Measurable(p, z);
            cv[k] = measurable ? Math.Sqrt(Math.Max(p.Variance, 0)) / p.Mean : double.NaN;
            fano[k] = measurable ? p.Variance / p.Mean : double.NaN;
            shapes[k] = SampleShape.Of(p.Histogram);
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
        var context = new Evidence(quantity, points, thresholds, deviations, resolved, cv, modes, shapes, scale, stretch);
        var (window, windowStart) = LateWindow(context);
        var verdicts = new List<QuantityVerdict>();
        MeanShiftTest? tested = null;
        if (minimumReplicates < thresholds.MinimumReplicates)
            verdicts.Add(TooFewReplicates(context, minimumReplicates));
        else
        {
            var shift = tested = MeanShiftTest.Run(points, deviations, shapes, thresholds);
            // Along a limit cycle the mean and the expansions describe dephasing, not the replicates (section 7).
            var onCycle = oscillation is { OnCycle: true };
            if (!onCycle && shift.Verdict(quantity, points, deviations, thresholds) is { } shifted) verdicts.Add(shifted);
            if (!onCycle && NoiseVerdict.Judge(context, window, windowStart) is { } noisy) verdicts.Add(noisy);
            if (Multimodal(context) is { } multimodal) verdicts.Add(multimodal);
            if ((!onCycle || oscillation!.Trough >= thresholds.ExtinctionFloor) && ExtinctionVerdict.Judge(context) is { } extinction) verdicts.Add(extinction);
            if (oscillation?.Verdict is { } rings) verdicts.Add(rings);
            if (verdicts.Count == 0) verdicts.Add(Adequate(context, shift));
            // Why there is no CV verdict, said wherever the quantity's verdicts are read.
            else if (NoiseStatement.For(context, window) is { } statement)
                verdicts[^1] = verdicts[^1] with { Sentence = verdicts[^1].Sentence + "; " + statement };
        }

        return new QuantityContrast(quantity)
        {
            Times = points.Select(p => p.Time).ToArray(),
            Deviations = deviations,
            Resolved = resolved,
            DeviationFromCorrectedMean = fromCorrected,
            LnaVariance = points.Select(p => p.LnaVariance).ToArray(),
            CorrectedMean = points.Select(p => p.CorrectedMean).ToArray(),
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
            MeanShiftTimesJudged = tested?.Eligible.Length ?? 0,
            MeanShiftTimesFlagged = tested?.Flagged.Length ?? 0,
            FalseAlarmRate = thresholds.FalseAlarmRate,
        };
    }

    // Bonferroni over the P phases: each phase's verdicts at α/P, so a verdict fires falsely in some phase of the quantity
    // with a chance of at most α, the run's own level (docs/methods-analysis.md, section 4).
    private static IReadOnlyList<PhaseContrast> PerPhase(string quantity, IReadOnlyList<ContrastPoint> points, ContrastThresholds thresholds, QuantityLattice? lattice,
        string? zeroOneLaw, QuantityOscillation? oscillation, IReadOnlyList<ModelPhase> phases)
    {
        var judged = ModelPhase.Within(phases, points.Count);
        if (judged.Count < 2) return [];
        var level = thresholds with { FalseAlarmRate = thresholds.FalseAlarmRate / judged.Count };
        return judged.Select(phase => new PhaseContrast(phase,
                Judge(quantity, points.Skip(phase.FirstPoint).Take(phase.Points).ToArray(), level, lattice, zeroOneLaw, oscillation, "phase"),
                level.FalseAlarmRate))
            .ToArray();
    }

    /// <summary>What the verdicts read about one quantity.</summary>
    internal sealed record Evidence(
        string Quantity, IReadOnlyList<ContrastPoint> Points, ContrastThresholds Thresholds,
        MeanDeviation[] Deviations, bool[] Resolved, double[] CoefficientOfVariation, ModeCountResult?[] Modes,
        SampleShape[] Shapes, NoiseScale Scale, string Stretch);

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

    private static (int[] Indices, double Start) LateWindow(Evidence e)
    {
        var first = e.Points[0].Time;
        var last = e.Points[^1].Time;
        var from = last - e.Thresholds.LateFraction * (last - first);
        var indices = Enumerable.Range(0, e.Points.Count).Where(k => e.Points[k].Time >= from).ToArray();
        return (indices, e.Points[indices[0]].Time);
    }

    private static QuantityVerdict TooFewReplicates(Evidence e, long minimum)
    {
        var at = e.Points.First(p => p.Replicates == minimum);
        return new QuantityVerdict(e.Quantity, VerdictKind.TooFewReplicates,
            $"only {minimum} replicates at t = {Time(at.Time)}; at least {e.Thresholds.MinimumReplicates} are needed before any other verdict is drawn");
    }

    private static QuantityVerdict Adequate(Evidence e, MeanShiftTest shift)
    {
        var t = e.Thresholds;
        string deviation;
        if (shift.Eligible.Length == 0)
            deviation = $"no grid time where the rate equations hold ≥ {Number(t.DeterministicFloor)} {(t.DeterministicFloor == 1 ? "copy" : "copies")} to judge a relative deviation on";
        else
        {
            var rule = $"no deviation from the rate equations beyond {Percent(t.RelativeDeviation)} is resolved at false-alarm rate {Percent(t.FalseAlarmRate)} over {VerdictText.Count(shift.Eligible.Length, "grid time", "grid times")}";
            var top = shift.LargestResolved(e.Points, e.Deviations);
            deviation = top < 0
                ? $"{rule}; none differs from 0 beyond the simultaneous band"
                : $"{rule}; largest resolved from 0 {VerdictText.SignedPercent(e.Deviations[top].Relative)} ± {Percent(shift.RelativeBand(e.Points[top]))} at t = {Time(e.Deviations[top].Time)}";
        }
        var last = e.Points[^1];
        var (window, _) = LateWindow(e);
        var noise = NoiseStatement.For(e, window) is { } statement ? "; " + statement
            : double.IsFinite(e.CoefficientOfVariation[^1]) ? $", coefficient of variation {Number(e.CoefficientOfVariation[^1])} at the end" : "";
        var modes = e.Modes[^1] is null ? "" : ", one mode";
        var zero = double.IsNaN(last.ProbabilityOfZero) ? "" : $", P(0) = {VerdictText.Number(last.ProbabilityOfZero, 1.0 / last.Replicates)}";
        return new QuantityVerdict(e.Quantity, VerdictKind.Adequate,
            $"{deviation}{modes}{zero}{noise}; thresholds {Percent(t.RelativeDeviation)} deviation, coefficient of variation {Number(t.CoefficientOfVariation)}, "
            + $"P(0) {Number(t.ExtinctionProbability)}");
    }

    private static string Time(double t) => VerdictText.Time(t);

    private static string Number(double x) => VerdictText.Number(x);

    private static string Percent(double fraction) => VerdictText.Percent(fraction);
}
