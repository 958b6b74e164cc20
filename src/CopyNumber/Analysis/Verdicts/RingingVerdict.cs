using CopyNumber.Analysis.Oscillation;
using static CopyNumber.Analysis.Verdicts.VerdictText;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// "noise-driven ringing": the rate equations are not on a limit cycle, yet the replicates' averaged spectrum has a coherent
/// peak (<see cref="SpectralPeak"/>, false-alarm rate α per species and run, Bonferroni over the frequencies). With a stable
/// focus the sentence gives the LNA spectrum's peak beside it (McKane &amp; Newman 2005): the rate equations are quiet, but
/// noise makes the circuit ring.
/// </summary>
public static class RingingVerdict
{
    /// <summary>The verdict on <paramref name="species"/>, or null when there is no sample, the rate equations cycle, or no peak is found.</summary>
    public static QuantityVerdict? For(RunOscillation run, string species, ContrastThresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(thresholds);
        if (run.RateEquations.Kind == OscillationKind.LimitCycle || run.For(species) is not { } ensemble || !ensemble.Spectrum.Peak.Found) return null;
        var peak = ensemble.Spectrum.Peak;
        var rateEquations = run.RateEquations.Kind == OscillationKind.DampedOscillation
            ? $"the rate equations settle into a stable focus (eigenvalues {OscillationSentence.Format(run.RateEquations.LeastDampedComplexPair!.Value)}, damped period {Number(run.RateEquations.Period)})"
            : "the rate equations do not oscillate";
        var lna = ensemble.LnaPower is { } power ? LnaComparison(ensemble, power) : "";
        var (coherence, coherenceError) = ensemble.CoherenceTime;
        var coherenceText = double.IsFinite(coherence) ? $"; coherence time {Number(coherence)} ± {Number(coherenceError)}" : "";
        return new QuantityVerdict(species, VerdictKind.NoiseDrivenRinging,
            $"{rateEquations}, but the replicates ring: spectral peak at period {Number(peak.Period)} ({Number(peak.Ratio)} times the low-frequency power, "
            + $"{Number(peak.Statistic)} standard errors above it, threshold {Number(peak.Threshold)}, false-alarm rate {Percent(thresholds.FalseAlarmRate)}){lna}{coherenceText}; "
            + $"sample: first {run.Sample!.Replicates} replicates over {Number(run.Sample.Window)}");
    }

    private static string LnaComparison(SpeciesOscillation ensemble, double[] lna)
    {
        var top = 1;
        for (var k = 1; k < lna.Length; k++) if (lna[k] > lna[top]) top = k;
        var spectrum = ensemble.Spectrum;
        var k0 = Array.IndexOf(spectrum.Frequencies, spectrum.Peak.Frequency);
        var ratio = k0 >= 0 && lna[k0] > 0 ? spectrum.Power[k0] / lna[k0] : double.NaN;
        var error = k0 >= 0 && lna[k0] > 0 ? spectrum.PowerError[k0] / lna[k0] : double.NaN;
        return $"; the linear noise approximation's spectrum peaks at period {Number(2 * Math.PI / spectrum.Frequencies[top])}, and at the ensemble's peak the ensemble power is {Number(ratio)} ± {Number(error)} times the LNA's";
    }
}
