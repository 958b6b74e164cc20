using BenchmarkDotNet.Attributes;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// Replicates per second through <see cref="EnsembleRunner.Run"/> at 1 and 2 worker threads: 2 048 replicates
/// of the promoter model to t = 200 on a grid of step 1 by the direct method, with the exact histograms
/// accumulated. The Events column here counts replicates, so Events/s is replicates per second.
/// </summary>
[MemoryDiagnoser]
[Config(typeof(EventsPerSecondConfig))]
public class EnsembleBenchmarks : IEventCount
{
    private const long Replicates = 2048;
    private ReactionNetwork _network = null!;

    [Params(1, 2)]
    public int Threads { get; set; }

    [GlobalSetup]
    public void Setup() => _network = BenchmarkModels.Load("promoter_switch.cnet");

    [Benchmark]
    public long Ensemble()
    {
        var options = new EnsembleOptions
        {
            Grid = new TimeGrid(200, 1),
            Replicates = Replicates,
            Seed = 7,
            Method = SimulationMethod.Direct,
            Threads = Threads,
        };
        return EnsembleRunner.Run(_network, options).ReplicatesFinished;
    }

    public long CountEvents() => Replicates;
}
