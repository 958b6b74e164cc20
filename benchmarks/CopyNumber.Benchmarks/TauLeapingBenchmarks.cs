using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// One replicate of <see cref="HighCopyModel"/> (counts ~10^5) by the direct method and by tau-leaping at
/// ε = 0.03: the ratio of the mean times is tau-leaping's speed-up. For tau-leaping the Events column counts
/// the firings its leaps stand for.
/// </summary>
public class TauLeapingBenchmarks : ReplicateBenchmark
{
    [Params(SimulationMethod.Direct, SimulationMethod.TauLeap)]
    public SimulationMethod Method { get; set; }

    protected override ulong Seed => 2006;

    [GlobalSetup]
    public override void Setup()
    {
        Simulator = SimulatorFactory.Create(Method, HighCopyModel.Load(), new SimulatorOptions(Epsilon: 0.03));
        Grid = new TimeGrid(HighCopyModel.Until, HighCopyModel.Every);
    }
}
