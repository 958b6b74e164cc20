using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// One fixed-seed replicate per invocation; subclasses make the simulator and grid in their
/// [GlobalSetup]. The Events column is the events that replicate fires, the same every invocation.
/// </summary>
[MemoryDiagnoser]
[Config(typeof(EventsPerSecondConfig))]
public abstract class ReplicateBenchmark : IEventCount
{
    private readonly DiscardObserver _observer = new();

    protected IStochasticSimulator Simulator { get; set; } = null!;
    protected TimeGrid Grid { get; set; } = null!;
    protected abstract ulong Seed { get; }

    public abstract void Setup();

    [Benchmark]
    public long Replicate()
    {
        var rng = ReplicateStreams.For(Seed, 0);
        return Simulator.Run(ref rng, Grid, _observer).Events;
    }

    public long CountEvents()
    {
        Setup();
        return Replicate();
    }
}

/// <summary>Takes the recorded states and drops them: the benchmarks time the simulator alone.</summary>
internal sealed class DiscardObserver : ITrajectoryObserver
{
    public long Last;

    public void Record(int gridIndex, double time, long[] counts, double[] parameters) => Last = counts[0];
}
