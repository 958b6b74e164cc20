using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// The direct method's loop generated for the network (Stochastic/Compiled) against the general loop, on one
/// replicate of the promoter model to t = 2000 (same fixed seed, so both fire the same events: the two
/// loops give identical trajectories). Events per second = Events / mean time.
/// </summary>
public class DirectLoopBenchmarks : ReplicateBenchmark
{
    [Params(true, false)]
    public bool Compiled { get; set; }

    [Params("promoter_switch.cnet", "repressor_dimer.cnet")]
    public string Scenario { get; set; } = "";

    protected override ulong Seed => 2026;

    [GlobalSetup]
    public override void Setup()
    {
        Simulator = new DirectMethod<LinearSelection>(BenchmarkModels.Load(Scenario), new SimulatorOptions(), Compiled);
        Grid = new TimeGrid(2000, 20);
    }
}
