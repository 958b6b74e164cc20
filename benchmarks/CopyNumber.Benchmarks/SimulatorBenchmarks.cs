using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// One replicate of the promoter model, long enough for about a million events, per method. Events per
/// second = the Events column (fired by that fixed-seed replicate) divided by the mean time.
/// </summary>
[MemoryDiagnoser]
[Config(typeof(EventsPerSecondConfig))]
public class SimulatorBenchmarks
{
    private IStochasticSimulator _simulator = null!;
    private TimeGrid _grid = null!;
    private readonly DiscardObserver _observer = new();

    [Params(SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.TauLeap)]
    public SimulationMethod Method { get; set; }

    [Params("promoter_switch.cnet")]
    public string Scenario { get; set; } = "";

    [Params(2000.0)]
    public double Until { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        (_simulator, _grid) = Create(Scenario, Method, Until);
    }

    internal static (IStochasticSimulator, TimeGrid) Create(string scenario, SimulationMethod method, double until)
    {
        var network = BenchmarkModels.Load(scenario);
        return (SimulatorFactory.Create(method, network, new SimulatorOptions()), new TimeGrid(until, until / 100));
    }

    [Benchmark]
    public long Replicate()
    {
        var rng = ReplicateStreams.For(2026, 0);
        return _simulator.Run(ref rng, _grid, _observer).Events;
    }

    /// <summary>The events one benchmark invocation fires: the same fixed-seed replicate every time.</summary>
    internal static long EventsOf(string scenario, SimulationMethod method, double until)
    {
        var (simulator, grid) = Create(scenario, method, until);
        var rng = ReplicateStreams.For(2026, 0);
        return simulator.Run(ref rng, grid, new DiscardObserver()).Events;
    }
}

/// <summary>Takes the recorded states and drops them: the benchmarks time the simulator alone.</summary>
internal sealed class DiscardObserver : ITrajectoryObserver
{
    public long Last;

    public void Record(int gridIndex, double time, long[] counts) => Last = counts[0];
}
