using System.Diagnostics;
using CopyNumber.MasterEquation;
using CopyNumber.Network;

namespace CopyNumber.Benchmarks;

/// <summary>
/// Timings of the master-equation solver for docs/performance.md (<c>dotnet run -c Release -- exact</c>):
/// the toggle pair with its synthesis scaled up tenfold (up to ~300 copies of each) solved to t = 100, the
/// repressor_dimer scenario to t = 50 (optional third argument: automatic, uniformisation or krylov), and
/// the sparse product on a projection of 10⁶ states at 1 and 2 threads (state-updates per second, memory).
/// </summary>
internal static class MasterEquationTiming
{
    /// <summary>The toggle scenario's circuit with a = 300, K = 100: about 300 copies of the winning gene's product.</summary>
    public const string Toggle300 =
        "species\n  U = 250\n  V = 20\nparameters\n  a = 300\n  K = 100\n  n = 2\n  d = 1\n"
        + "reactions\n  make_u: 0 -> U rate a * hill_rep(V, K, n)\n  make_v: 0 -> V rate a * hill_rep(U, K, n)\n"
        + "  decay_u: U -> 0 mass d\n  decay_v: V -> 0 mass d\n";

    public static void Run(string[] args)
    {
        var stepping = args.Length >= 3 ? Enum.Parse<Stepping>(args[2], ignoreCase: true) : Stepping.Automatic;
        if (args.Length < 2 || args[1] == "toggle")
        {
            var network = ModelLoader.LoadText(Toggle300, "toggle300.cnet").Model!.Network;
            foreach (var threads in (Environment.GetEnvironmentVariable("EXACT_THREADS") ?? "2,1").Split(',').Select(int.Parse))
                Report($"toggle300 to t = 100, {threads} thread(s), {stepping}", FiniteStateProjection.Solve(network, new TimeGrid(double.Parse(Environment.GetEnvironmentVariable("EXACT_UNTIL") ?? "100"), 1), new ExactOptions(1e-6, Threads: threads, Stepping: stepping)));
        }
        if (args.Length < 2 || args[1] == "repressor")
        {
            var path = Path.Combine(FindScenarios(), "repressor_dimer.cnet");
            var network = ModelLoader.LoadText(File.ReadAllText(path), path).Model!.Network;
            Report($"repressor_dimer to t = 50, 2 threads, {stepping}", FiniteStateProjection.Solve(network, new TimeGrid(50, 5), new ExactOptions(1e-6, Threads: 2, Stepping: stepping)));
        }
        if (args.Length < 2 || args[1] == "million") Million();
    }

    private static void Report(string what, ExactSolution solution) =>
        Console.WriteLine($"{what}: {solution.WallTime.TotalSeconds:F2} s, {solution.States[^1]:N0} states at the end, "
            + $"max bound {solution.Bound.Max():G3} (stepping {solution.SteppingError[^1]:G3}, Krylov estimate {solution.KrylovError:G3}), Λ = {solution.LargestRate:G4}, "
            + $"{solution.Products:N0} products, {solution.KrylovSteps:N0} Krylov steps, {solution.RefusedSteps:N0} steps refused by the projection");

    private static string FindScenarios()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (Directory.Exists(Path.Combine(dir.FullName, "scenarios"))) return Path.Combine(dir.FullName, "scenarios");
        throw new DirectoryNotFoundException("scenarios/ not found above the benchmark's folder");
    }

    /// <summary>Two independent immigration–death species on the box [0, 999]², 10⁶ states, 4 reactions: products at 1 and 2 threads.</summary>
    private static void Million()
    {
        var network = ModelLoader.LoadText("species\n  X = 500\n  Y = 500\nreactions\n  bx: 0 -> X mass 500\n  dx: X -> 0 mass 1\n  by: 0 -> Y mass 500\n  dy: Y -> 0 mass 1\n", "box.cnet").Model!.Network;
        var before = GC.GetTotalMemory(forceFullCollection: true);
        var space = new StateSpace(StateCoding.For(network), 1_000_000);
        for (var x = 0; x < 1000; x++)
            for (var y = 0; y < 1000; y++) space.Add([x, y]);
        var constants = new double[4];
        network.Propensities.ComputeConstants(network.InitialParameterValues.ToArray(), constants);
        foreach (var threads in new[] { 1, 2, 1, 2 })
        {
            var parallel = new ParallelOptions { MaxDegreeOfParallelism = threads };
            var generator = Generator.Build(space, network, constants, network.InitialParameterValues.ToArray(), parallel);
            var propagator = new Uniformisation(generator, parallel);
            var p = new double[space.Count];
            p[space.IndexOf([500, 500])] = 1;
            var result = new double[space.Count];
            var occupancy = new double[space.Count];
            var clock = Stopwatch.StartNew();
            var cpu = Process.GetCurrentProcess().TotalProcessorTime;
            propagator.Advance(p, 100 / propagator.Rate, 1e-12, result, occupancy);
            var seconds = clock.Elapsed.TotalSeconds;
            var cpuSeconds = (Process.GetCurrentProcess().TotalProcessorTime - cpu).TotalSeconds;
            var heap = GC.GetTotalMemory(forceFullCollection: false) - before;
            Console.WriteLine($"10^6 states, {generator.Entries:N0} transitions, {threads} thread(s): {propagator.Products} products in {seconds:F2} s = "
                + $"{space.Count * (double)propagator.Products / seconds / 1e6:F1} M state-updates/s (wall), {space.Count * (double)propagator.Products / cpuSeconds / 1e6:F1} M per CPU-second; "
                + $"managed heap {heap / 1e6:F0} MB, working set {Process.GetCurrentProcess().WorkingSet64 / 1e6:F0} MB");
        }
    }
}
