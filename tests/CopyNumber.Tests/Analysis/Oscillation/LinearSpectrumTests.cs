using CopyNumber.Analysis.Oscillation;
using CopyNumber.Network;
using MathNet.Numerics.Distributions;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis.Oscillation;

/// <summary>The spectrum estimator and the LNA spectrum on a linear network, where the LNA is exact.</summary>
public sealed class LinearSpectrumTests(ITestOutputHelper output)
{
    /// <summary>
    /// Immigration–death 0 → X (k), X → 0 (d·X): stationary Poisson(k/d), autocovariance (k/d)·e^(−d|τ|), so the two-sided
    /// spectrum is S(ω) = 2k/(d² + ω²) copies² × time exactly (common practice: the Ornstein–Uhlenbeck / linear birth–death
    /// spectrum; e.g. Gardiner 2009, Stochastic Methods, §3.8; quoted from memory). The paths' variance must be k/d and the
    /// averaged periodogram must match S within z·SE (Bonferroni over the bins compared, failure probability ≤ 0.1%);
    /// the Hann window's smoothing of a Lorentzian of half-width d = 1 over a window of 200 time units is below 10⁻³ relative.
    /// </summary>
    [Fact]
    public void ImmigrationDeathSpectrumIsTheExactLorentzian()
    {
        const double k = 50, d = 1;
        var network = Simulate.Network("""
            species
              X = 50
            reactions
              make:  0 -> X  mass 50
              decay: X -> 0  mass 1
            """, "immigration_death.cnet");
        var sample = OscillationSample.Record(network, step: 0.1, discard: 10, horizon: 210, count: 200, seed: 7, threads: 2);
        var paths = sample.Paths[0];
        var all = paths.SelectMany(p => p).ToArray();
        var mean = all.Average();
        var variance = all.Select(v => (v - mean) * (v - mean)).Average();
        output.WriteLine($"mean {mean:G4} (exact {k / d}), variance {variance:G4} (exact {k / d})");
        var spectrum = EnsembleSpectrum.Of(paths, sample.Step, 0.01);
        var lna = new LnaSpectrum(network, [k / d]);
        var compared = Enumerable.Range(0, spectrum.Frequencies.Length).Where(i => spectrum.Frequencies[i] is >= 0.2 and <= 5).ToArray();
        var z = Normal.InvCDF(0, 1, 1 - 0.001 / (2 * compared.Length));
        foreach (var i in compared.Where((_, j) => j % 40 == 0))
        {
            var w = spectrum.Frequencies[i];
            output.WriteLine($"ω {w:F3}: ensemble {spectrum.Power[i]:G4} ± {spectrum.PowerError[i]:G2}, exact {2 * k / (d * d + w * w):G4}, LNA {lna.Of(0, [w])[0]:G4}");
        }
        foreach (var i in compared)
        {
            var w = spectrum.Frequencies[i];
            var exact = 2 * k / (d * d + w * w);
            Assert.True(Math.Abs(lna.Of(0, [w])[0] / exact - 1) < 1e-10, $"LNA at ω = {w}");
        }
        var worst = compared.Max(i => Math.Abs(spectrum.Power[i] - 2 * k / (d * d + spectrum.Frequencies[i] * spectrum.Frequencies[i])) / spectrum.PowerError[i]);
        output.WriteLine($"worst |z| {worst:G3} (bound {z:G3})");
        Assert.True(worst <= z, $"ensemble differs from the exact spectrum by {worst:G3} standard errors (bound {z:G3})");
    }
}
