using CopyNumber.Analysis.Oscillation;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis.Oscillation;

/// <summary>The oscillation read from sample paths: per-replicate periods and amplitudes, coherence time, spectrum.</summary>
public sealed class EnsembleOscillationTests(ITestOutputHelper output)
{
    /// <summary>
    /// The ring scenario: every replicate oscillates near the rate equations' period (36.19), the spectrum has a
    /// coherent peak there, and the coherence time is finite (phases drift apart). The replicates' mean period is
    /// compared with the rate equations' within 10% (noise shifts a cycle's period at order 1/copy number, which is
    /// not small here at tens of copies in the troughs; common practice), and the spectral peak's period with the
    /// replicates' mean within the spectrum's resolution (one frequency bin).
    /// </summary>
    [Fact]
    public void RingReplicatesOscillateNearTheRateEquationsPeriod()
    {
        var network = OscillationModels.Ring();
        var result = RunOscillation.Analyse(network, 200, 200, seed: 5, threads: 2, alpha: 0.01);
        Assert.Equal(OscillationKind.LimitCycle, result.RateEquations.Kind);
        var p1 = result.For("p1")!;
        var (period, periodError, spread) = p1.Period;
        var (amplitude, amplitudeError, _) = p1.Amplitude;
        var (coherence, coherenceError) = p1.CoherenceTime;
        output.WriteLine($"window {result.Sample!.Window}, step {result.Sample.Step}, replicates {result.Sample.Replicates}");
        output.WriteLine($"period {period} ± {periodError} (spread {spread}), amplitude {amplitude} ± {amplitudeError}, coherence {coherence} ± {coherenceError}");
        output.WriteLine($"peak {p1.Spectrum.Peak}");
        foreach (var s in result.Species) output.WriteLine($"{s.Species}: T {s.Period}, A {s.Amplitude}, tau {s.CoherenceTime}, peak {s.Spectrum.Peak.Found} {s.Spectrum.Peak.Period}");
        Assert.Equal(result.Sample.Replicates, p1.ReplicatesWithPeriod);
        Assert.True(Math.Abs(period / result.RateEquations.Period - 1) < 0.1);
        Assert.True(p1.Spectrum.Peak.Found);
        var bin = p1.Spectrum.Frequencies[1];
        Assert.True(Math.Abs(p1.Spectrum.Peak.Frequency - 2 * Math.PI / period) <= bin * 1.01, $"peak {p1.Spectrum.Peak.Frequency} against {2 * Math.PI / period}");
        Assert.True(double.IsFinite(coherence) && coherence > 0 && coherenceError > 0);
    }
}
