using System.Diagnostics;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>
/// A quick events-per-second probe for development on a loaded machine: the best of several timed rounds
/// of fixed-seed replicates (the minimum is the round least disturbed by other processes). Not a
/// replacement for the BenchmarkDotNet suites, whose figures go into docs/performance.md.
/// </summary>
internal static class QuickTiming
{
    public static void Run(string[] args)
    {
        if (args.Length > 1 && args[1] == "ensemble")
        {
            RunEnsemble();
            return;
        }
        if (args.Length > 1 && args[1] == "lines")
        {
            LayoutFootprint.Run(args.Skip(2).Select(int.Parse).DefaultIfEmpty(0).ToArray());
            return;
        }
        if (args.Length > 1 && args[1] == "large")
        {
            // `quick large [cr] [M …]`: with `cr`, composition–rejection's layouts only.
            var crOnly = args.Length > 2 && args[2] == "cr";
            RunLarge(args.Skip(crOnly ? 3 : 2).Select(int.Parse).DefaultIfEmpty(0).ToArray(),
                crOnly ? [SimulationMethod.CompositionRejection] : [SimulationMethod.Direct, SimulationMethod.NextReaction, SimulationMethod.CompositionRejection]);
            return;
        }
        var scenario = args.Length > 1 ? args[1] : "promoter_switch.cnet";
        var highCopy = scenario == "high-copy";
        var until = highCopy ? HighCopyModel.Until : args.Length > 2 ? double.Parse(args[2], System.Globalization.CultureInfo.InvariantCulture) : 2000.0;
        var network = highCopy ? HighCopyModel.Load() : BenchmarkModels.Load(scenario);
        var grid = highCopy ? new TimeGrid(until, HighCopyModel.Every) : new TimeGrid(until, until / 100);
        foreach (var method in Enum.GetValues<SimulationMethod>())
        {
            var simulator = SimulatorFactory.Create(method, network, new SimulatorOptions());
            var (wall, cpu) = Measure(simulator, grid);
            Console.WriteLine($"{method,-21} {wall / 1e6,8:F2} M events/s (wall)  {cpu / 1e6,8:F2} M events per CPU-second");
        }
        // The direct method's general loop, for comparison with the loop generated for the network (the row above).
        var general = new DirectMethod<LinearSelection>(network, new SimulatorOptions(), compiled: false);
        var (generalWall, generalCpu) = Measure(general, grid);
        Console.WriteLine($"{"Direct, general loop",-21} {generalWall / 1e6,8:F2} M events/s (wall)  {generalCpu / 1e6,8:F2} M events per CPU-second");
    }

    /// <summary>
    /// Replicates per wall second and per CPU second through the ensemble runner at 1 and 2 threads. On a
    /// shared machine the wall figure depends on what else runs; equal figures per CPU second at 1 and 2
    /// threads show that the runner itself adds no serial work or contention.
    /// </summary>
    private static void RunEnsemble()
    {
        var network = BenchmarkModels.Load("promoter_switch.cnet");
        var process = Process.GetCurrentProcess();
        foreach (var threads in new[] { 1, 2, 1, 2 })
        {
            double bestWall = 0, bestCpu = 0;
            for (var round = 0; round < 5; round++)
            {
                var options = new Ensembles.EnsembleOptions
                {
                    Grid = new TimeGrid(200, 1), Replicates = 2048, Seed = 7, Method = SimulationMethod.Direct, Threads = threads,
                };
                process.Refresh();
                var cpuStart = process.TotalProcessorTime;
                var clock = Stopwatch.StartNew();
                var done = Ensembles.EnsembleRunner.Run(network, options).ReplicatesFinished;
                var wall = clock.Elapsed.TotalSeconds;
                process.Refresh();
                var cpu = (process.TotalProcessorTime - cpuStart).TotalSeconds;
                bestWall = Math.Max(bestWall, done / wall);
                bestCpu = Math.Max(bestCpu, done / cpu);
            }
            Console.WriteLine($"{threads} thread(s): {bestWall,8:F0} replicates/s (wall) {bestCpu,8:F0} replicates per CPU-second");
        }
    }

    private static void RunLarge(int[] sizes, SimulationMethod[] methods)
    {
        if (sizes is [0]) sizes = [10, 100, 1_000, 10_000, 100_000];
        foreach (var m in sizes)
        {
            var network = SyntheticNetwork.Create(m);
            Console.WriteLine($"M = {m,7}: {DependentsPerEvent(network):F1} propensity updates per event (initial state, propensity-weighted)");
            var options = new SimulatorOptions(MaxEvents: LargeNetworkBenchmarks.EventsPerInvocation);
            var simulators = methods.Select(method => (method.ToString(), SimulatorFactory.Create(method, network, options))).ToList();
            // Composition–rejection on the user's numbering and flat arrays (the reference the packed layout must
            // reproduce to the bit), and the packed layout with prefetches and without the renumbering.
            simulators.Add(("CR, reference layout", new DirectMethod<CompositionRejection>(network, options)));
            simulators.Add(("CR, packed, prefetch", new Stochastic.Locality.PackedCompositionRejection(network, options, prefetch: true)));
            simulators.Add(("CR, packed, user order", new Stochastic.Locality.PackedCompositionRejection(network, options, renumber: false)));
            foreach (var (name, simulator) in simulators)
            {
                var (wall, cpu) = Measure(simulator, new TimeGrid(1e9, 1e7), rounds: 5, sameReplicate: true);
                Console.WriteLine($"M = {m,7} {name,-23} {wall / 1e6,7:F2} M events/s (wall) {cpu / 1e6,7:F2} M events per CPU-second  {1e9 / cpu,7:F1} CPU-ns per event");
            }
        }
    }

    /// <summary>Σ_j a_j·|dependents of j| / a0 at the initial state: the updates an event costs on average.</summary>
    private static double DependentsPerEvent(ReactionNetwork network)
    {
        var effects = new ReactionEffects(network, includeFired: false);
        var state = new SimulatorState(network);
        state.Reset();
        double weighted = 0, total = 0;
        for (var j = 0; j < state.ReactionCount; j++)
        {
            var a = state.Evaluate(j, 0);
            weighted += a * (effects.DependentStart[j + 1] - effects.DependentStart[j]);
            total += a;
        }
        return weighted / total;
    }

    /// <summary>
    /// Best events per wall-clock second and per CPU second of this process over rounds of about 0.2 s
    /// each. On a shared machine the CPU figure is the steadier one: time the scheduler gives to other
    /// processes is not counted.
    /// </summary>
    public static (double Wall, double Cpu) Measure(IStochasticSimulator simulator, TimeGrid grid, int rounds = 15, bool sameReplicate = false)
    {
        var observer = new DiscardObserver();
        var process = Process.GetCurrentProcess();
        double bestWall = 0.0, bestCpu = 0.0;
        for (var round = 0; round < rounds; round++)
        {
            process.Refresh();
            var cpuStart = process.TotalProcessorTime;
            var clock = Stopwatch.StartNew();
            var events = 0L;
            var replicate = 0L;
            while (clock.ElapsedMilliseconds < 200)
            {
                var rng = ReplicateStreams.For(2026, sameReplicate ? 0 : replicate++);
                events += simulator.Run(ref rng, grid, observer).Events;
            }
            var wall = clock.Elapsed.TotalSeconds;
            process.Refresh();
            var cpu = (process.TotalProcessorTime - cpuStart).TotalSeconds;
            bestWall = Math.Max(bestWall, events / wall);
            if (cpu > 0) bestCpu = Math.Max(bestCpu, events / cpu);
        }
        return (bestWall, bestCpu);
    }
}
