using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// Cost per event as the network grows: one fixed-seed replicate of a <see cref="SyntheticNetwork"/> of M
/// reactions, stopped by the event limit after exactly <see cref="EventsPerInvocation"/> events, per exact
/// method. The direct method selects from a sum tree above 64 reactions.
/// </summary>
public class LargeNetworkBenchmarks : ReplicateBenchmark
{
    public const long EventsPerInvocation = 200_000;

    [Params(10, 100, 1_000, 10_000, 100_000)]
    public int Reactions { get; set; }

    [Params(SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.CompositionRejection)]
    public SimulationMethod Method { get; set; }

    protected override ulong Seed => 2008;

    [GlobalSetup]
    public override void Setup()
    {
        Simulator = SimulatorFactory.Create(Method, SyntheticNetwork.Create(Reactions), new SimulatorOptions(MaxEvents: EventsPerInvocation));
        // Far beyond what the event limit lets a replicate reach, so every invocation fires the same events.
        Grid = new TimeGrid(1e9, 1e7);
    }
}
