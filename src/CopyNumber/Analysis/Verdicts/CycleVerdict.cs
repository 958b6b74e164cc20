using CopyNumber.Analysis.Oscillation;
using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// "cycles with the rate equations" or "cycle lost to noise", for a species while the rate equations run on a limit cycle:
/// the first when the ensemble's averaged spectrum has a coherent peak (<see cref="SpectralPeak"/>, false-alarm rate α),
/// the second when it has none. The sentence sets the replicates' period and amplitude (mean ± standard error, spread)
/// against the cycle's, gives the coherence time (<see cref="PhaseDiffusion"/>) and says why the mean is not compared.
/// </summary>
public static class CycleVerdict
{
    /// <summary>The verdict on <paramref name="species"/>; null when the rate equations are not on a cycle.</summary>
    public static QuantityOscillation For(RunOscillation run, string species, ContrastThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(thresholds);
        var cycle = run.RateEquations;
        var range = cycle.Ranges.FirstOrDefault(r => r.Species == species);
        if (cycle.Kind != OscillationKind.LimitCycle || range is null) return new QuantityOscillation(false, double.NaN, null);
        var trough = range.Minimum < thresholds.ExtinctionFloor
            ? $"; extinction not judged: the rate equations themselves fall to {Number(range.Minimum)} copies in every trough"
            : "";
        var deterministic = $"the rate equations' cycle has period {Number(cycle.Period)} and amplitude {Number(range.Amplitude)} copies ({Number(range.Minimum)} to {Number(range.Maximum)})";
        if (run.For(species) is not { } ensemble)
            return new QuantityOscillation(true, range.Minimum, new QuantityVerdict(species, VerdictKind.CyclesWithRateEquations,
                $"{deterministic}; {run.Note ?? "no sample paths"}; the mean, the linear noise approximation and the corrected mean are not compared along a cycle{trough}"));
        var sample = run.Sample!;
        var peak = ensemble.Spectrum.Peak;
        var (period, periodError, periodSpread) = ensemble.Period;
        var (amplitude, amplitudeError, amplitudeSpread) = ensemble.Amplitude;
        var (coherence, coherenceError) = ensemble.CoherenceTime;
        var coherenceText = double.IsPositiveInfinity(coherence) ? $"coherence time beyond the window of {Number(sample.Window)}"
            : double.IsFinite(coherence) ? $"coherence time {Number(coherence)} ± {Number(coherenceError)} (1/D, the phase diffusion constant)"
            : "coherence time not measured (too few cycles per replicate)";
        var sampleText = $"sample: first {sample.Replicates} replicates, {OscillationSample.PointsPerPeriod} points per period over {Number(sample.Window)} after a transient of {Number(sample.Discarded)}";
        if (!peak.Found)
            return new QuantityOscillation(true, range.Minimum, new QuantityVerdict(species, VerdictKind.CycleLostToNoise,
                $"{deterministic}, but the replicates' averaged spectrum has no coherent peak (largest rise over the low-frequency power {Number(peak.Statistic)} standard errors, "
                + $"below {Number(peak.Threshold)}; false-alarm rate {Percent(thresholds.FalseAlarmRate)}); {coherenceText}; {sampleText}{trough}"));
        var periods = double.IsFinite(period)
            ? $"period {Number(period)} ± {Number(periodError)} (standard error; replicates' spread {Number(periodSpread)}) against {Number(cycle.Period)} by the rate equations; "
              + $"amplitude {Number(amplitude)} ± {Number(amplitudeError)} copies (spread {Number(amplitudeSpread)}) against {Number(range.Amplitude)}"
            : $"too few complete cycles per replicate for a period (rate equations: {Number(cycle.Period)})";
        return new QuantityOscillation(true, range.Minimum, new QuantityVerdict(species, VerdictKind.CyclesWithRateEquations,
            $"oscillating in {ensemble.ReplicatesWithPeriod} of {sample.Replicates} replicates: {periods}; spectral peak at period {Number(peak.Period)} "
            + $"({Number(peak.Ratio)} times the low-frequency power, {Number(peak.Statistic)} standard errors above it, threshold {Number(peak.Threshold)}); {coherenceText}. "
            + $"The replicates drift out of phase, so the ensemble mean flattens: the mean, the linear noise approximation and the corrected mean are not compared along the cycle; {sampleText}{trough}"));
    }
}
