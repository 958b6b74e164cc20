using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// One replicate of the promoter model (about 40 000 events to t = 2000), per method. Events per second =
/// the Events column (fired by that fixed-seed replicate) divided by the mean time.
/// </summary>
public class SimulatorBenchmarks : ReplicateBenchmark
{
    [Params(SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.TauLeap, SimulationMethod.CompositionRejection)]
    public SimulationMethod Method { get; set; }

    [Params("promoter_switch.cnet")]
    public string Scenario { get; set; } = "";

    [Params(2000.0)]
    public double Until { get; set; }

    protected override ulong Seed => 2026;

    [GlobalSetup]
    public override void Setup()
    {
        Simulator = SimulatorFactory.Create(Method, BenchmarkModels.Load(Scenario), new SimulatorOptions());
        Grid = new TimeGrid(Until, Until / 100);
    }
}
