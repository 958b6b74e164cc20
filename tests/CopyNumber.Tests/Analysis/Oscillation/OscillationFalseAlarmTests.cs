using CopyNumber.Analysis.Oscillation;
using MathNet.Numerics.Distributions;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis.Oscillation;

/// <summary>
/// The false-alarm rate of the coherent-peak test that every oscillation verdict rests on, measured over 200 fixed seeds of
/// the real simulator on networks whose linearisation has only real eigenvalues (no ringing is possible: each species'
/// spectrum falls from ω = 0). An alarm is a peak found in a species of a run. Acceptance as in VerdictCalibrationTests: the
/// count must stay below c, the smallest count with P(Binomial(200, 0.01) ≥ c) ≤ 0.001 (an exact binomial test; common practice).
/// </summary>
public sealed class OscillationFalseAlarmTests(ITestOutputHelper output)
{
    private const int Seeds = 200;

    public static TheoryData<string> Models => new() { "two-stage", "immigration-death" };

    [Theory]
    [MemberData(nameof(Models))]
    public void RealEigenvaluesGiveAnOscillationVerdictInAtMostOnePercentOfRuns(string model)
    {
        var network = model == "two-stage" ? OscillationModels.TwoStage() : CopyNumber.Simulate.Network("""
            species
              A = 10
            reactions
              birth: 0 -> A  mass 10
              death: A -> 0  mass 1
            """, "immigration_death.cnet");
        var rateEquations = CycleDetection.Detect(network, 200);
        Assert.False(rateEquations.HasComplexEigenvalues);
        var alarms = new int[network.Species.Count];
        for (var seed = 1; seed <= Seeds; seed++)
        {
            // 100 replicates, a step of 0.5 over 100 time units after a transient of 20 (four times the slowest relaxation time 5).
            var sample = OscillationSample.Record(network, step: 0.5, discard: 20, horizon: 120, count: 100, seed: (ulong)seed, threads: 2);
            var run = RunOscillation.FromSample(network, rateEquations, sample, 0.01);
            for (var i = 0; i < alarms.Length; i++) if (run.Species[i].Spectrum.Peak.Found) alarms[i]++;
        }
        var limit = 0;
        var law = new Binomial(0.01, Seeds);
        while (1 - law.CumulativeDistribution(limit - 1) > 0.001) limit++;
        output.WriteLine($"{model}: alarms per species {string.Join(", ", alarms)} of {Seeds} runs (fail at {limit})");
        Assert.All(alarms, a => Assert.True(a < limit, $"{a} alarms in {Seeds} runs"));
    }
}
