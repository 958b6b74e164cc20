using CopyNumber.Analysis.Oscillation;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis.Oscillation;

/// <summary>
/// Phase diffusion of a limit cycle: the dephasing rate D (1 / coherence time) of a chemical clock falls like 1/Ω with the
/// system size (Gaspard 2002, J. Chem. Phys. 117:8905; quoted from memory). The Brusselator on its cycle (A = 1, B = 3) at
/// three sizes spanning a factor of 10; the least-squares slope of log D against log Ω must lie within −1 ± 0.2, as the issue asks.
/// </summary>
public sealed class PhaseDiffusionScalingTests(ITestOutputHelper output)
{
    [Fact]
    public void DephasingRateFallsLikeOneOverSize()
    {
        var sizes = new[] { 30.0, 100, 300 };
        var logSize = new List<double>();
        var logRate = new List<double>();
        foreach (var size in sizes)
        {
            var network = OscillationModels.Brusselator(1, 3, size, x0: 1.5, y0: 3);
            var cycle = CycleDetection.Detect(network, 400);
            Assert.Equal(OscillationKind.LimitCycle, cycle.Kind);
            var sample = OscillationSample.Record(network, cycle, until: 10 * cycle.Period, replicates: 200, seed: 21, threads: 2);
            var x = RunOscillation.FromSample(network, cycle, sample, 0.01).For("X")!;
            var (coherence, error) = x.CoherenceTime;
            output.WriteLine($"Ω = {size}: period {cycle.Period:G4}, window {sample.Window:G4}, coherence time {coherence:G4} ± {error:G3}, replicates' period {x.Period}");
            Assert.True(double.IsFinite(coherence) && coherence > 0);
            logSize.Add(Math.Log(size));
            logRate.Add(Math.Log(1 / coherence));
        }
        var mx = logSize.Average();
        var my = logRate.Average();
        var slope = logSize.Zip(logRate).Sum(p => (p.First - mx) * (p.Second - my)) / logSize.Sum(v => (v - mx) * (v - mx));
        output.WriteLine($"slope {slope:G4}");
        Assert.InRange(slope, -1.2, -0.8);
    }
}
