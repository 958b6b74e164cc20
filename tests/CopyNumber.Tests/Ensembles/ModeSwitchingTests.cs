using System.Text.Json;
using CopyNumber.Analysis.SteadyStates;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;
using CopyNumber.Storage;
using CopyNumber.Tests.Analysis;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.Ensembles;

/// <summary>Switching between the modes of a species, counted at the events with cores fixed before the run (issue 16).</summary>
public sealed class ModeSwitchingTests
{
    private const double KOn = 0.5, KOff = 1.5;

    private static string Telegraph(double kOn, double kOff) =>
        $"species\n  gene_off = 1\n  gene_on = 0\nparameters\n  k_on = {kOn}\n  k_off = {kOff}\n" +
        "reactions\n  activate: gene_off -> gene_on mass k_on\n  deactivate: gene_on -> gene_off mass k_off\n";

    private static IReadOnlyList<ModeCore> GeneCores(ReactionNetwork network) => ModeCore.Parse("gene_on=0..1", network);

    private static EnsembleResult Run(ReactionNetwork network, SimulationMethod method, double until, long replicates, IReadOnlyList<ModeCore> cores,
        Shard? shard = null, int threads = 2, ulong seed = 43, double? every = null) =>
        EnsembleRunner.Run(network, new EnsembleOptions
        {
            Grid = new TimeGrid(until, every ?? until / 4), Replicates = replicates, Seed = seed, Threads = threads, Method = method, Shard = shard ?? Shard.Whole,
            Simulator = new SimulatorOptions { Modes = cores },
        });

    /// <summary>
    /// The two-state Markov chain off ⇄ on (rates k_on, k_off) started off: P_on(t) = k_on/s·(1 − e^(−st)), s = k_on + k_off;
    /// switches occur at rate k_on·P_off + k_off·P_on, so over [0, T] their expected number is
    /// k_on·T + (k_off − k_on)·(k_on/s)·(T − (1 − e^(−sT))/s) (common practice; the textbook two-state chain, e.g. Karlin &amp;
    /// Taylor 1975, A First Course in Stochastic Processes; quoted from memory).
    /// </summary>
    private static double ExpectedSwitches(double kOn, double kOff, double until)
    {
        var s = kOn + kOff;
        return kOn * until + (kOff - kOn) * (kOn / s) * (until - (1 - Math.Exp(-s * until)) / s);
    }

    /// <summary>
    /// Changes seen between consecutive grid times t_k = k·Δ of the same chain: Σ_k [P_off(t_k)·k_on + P_on(t_k)·k_off]/s·(1 − e^(−sΔ)),
    /// since over Δ the chain is found in the other state with probability (rate out)/s·(1 − e^(−sΔ)) (same source).
    /// </summary>
    private static double ExpectedGridChanges(double kOn, double kOff, double every, int intervals)
    {
        var s = kOn + kOff;
        var total = 0.0;
        for (var k = 0; k < intervals; k++)
        {
            var on = kOn / s * (1 - Math.Exp(-s * k * every));
            total += ((1 - on) * kOn + on * kOff) / s * (1 - Math.Exp(-s * every));
        }
        return total;
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void The_telegraph_gene_stays_one_over_its_rate_in_each_state_and_switches_as_the_chain_says(SimulationMethod method)
    {
        const double until = 10;
        var network = AnalysisModels.Compile(Telegraph(KOn, KOff));
        var result = Run(network, method, until, replicates: 4000, GeneCores(network));
        var gene = Assert.Single(result.ModeSwitching);
        Assert.Equal((4000L, 0L, 0L), (gene.Replicates, gene.Excluded, gene.NeverEntered));
        // Residence in a state of a Markov chain is exponential with mean 1/(rate out) (common practice; Karlin & Taylor 1975):
        // off (the low core of gene_on) 1/k_on = 2, on 1/k_off = 2/3. Five standard errors: a false failure below 10⁻⁶ (normal approximation).
        (double Expected, int Mode)[] residences = [(1 / KOn, 0), (1 / KOff, 1)];
        foreach (var (expected, mode) in residences)
            Assert.True(Math.Abs(gene.MeanResidence(mode) - expected) <= 5 * gene.ResidenceStandardError(mode),
                $"{method}: mode {mode} residence {gene.MeanResidence(mode)} ± {gene.ResidenceStandardError(mode)}, expected {expected}");
        var switches = ExpectedSwitches(KOn, KOff, until); // 7.375
        Assert.True(Math.Abs(gene.MeanSwitches - switches) <= 5 * gene.SwitchesStandardError,
            $"{method}: {gene.MeanSwitches} ± {gene.SwitchesStandardError} switches, expected {switches}");
        // Each replicate ends in one mode: its last residence is censored there.
        Assert.Equal(4000, gene.LowMode.Censored + gene.HighMode.Censored);
        // A 0/1 species with cores 0 and 1 switches at every firing that changes it: the same integers as the transition count of issue 9.
        var transitions = result.Switching.Single(s => s.Species == "gene_on");
        Assert.Equal((transitions.Sum, transitions.SumOfSquares), (gene.SwitchSum, gene.SwitchSquares));
    }

    [Fact]
    public void The_grid_misses_switches_between_its_times_that_the_events_count()
    {
        // Switching every 0.2 time units on average, a grid of step 1 sees at most one change per step and misses
        // every switch and return between two grid times; the same replicates (same seed and streams) counted both ways.
        const double kOn = 5, kOff = 5, until = 20, every = 1;
        const int replicates = 400;
        const ulong seed = 7;
        var network = AnalysisModels.Compile(Telegraph(kOn, kOff));
        var grid = new TimeGrid(until, every);
        var gene = Assert.Single(Run(network, SimulationMethod.Direct, until, replicates, GeneCores(network), seed: seed, every: every).ModeSwitching);
        var samples = GridSamples.Run(network, SimulationMethod.Direct, grid, replicates, seed);
        var on = network.SpeciesIndex("gene_on");
        var changes = new double[replicates];
        for (var r = 0; r < replicates; r++)
            for (var k = 1; k < grid.Count; k++)
                if (samples.At(r, k, on) != samples.At(r, k - 1, on)) changes[r]++;
        var gridMean = changes.Average();
        var gridError = Math.Sqrt(changes.Select(c => (c - gridMean) * (c - gridMean)).Sum() / (replicates - 1) / replicates);
        var expectedEvents = ExpectedSwitches(kOn, kOff, until);                       // ≈ 99.5
        var expectedGrid = ExpectedGridChanges(kOn, kOff, every, grid.Count - 1);       // ≈ 9.5
        Assert.True(Math.Abs(gene.MeanSwitches - expectedEvents) <= 5 * gene.SwitchesStandardError,
            $"events: {gene.MeanSwitches} ± {gene.SwitchesStandardError}, expected {expectedEvents}");
        Assert.True(Math.Abs(gridMean - expectedGrid) <= 5 * gridError, $"grid: {gridMean} ± {gridError}, expected {expectedGrid}");
        // In the very replicates counted, the grid saw about a tenth of the switches.
        Assert.True(changes.Sum() < 0.2 * gene.SwitchSum, $"grid {changes.Sum()} against events {gene.SwitchSum}");
    }

    [Fact]
    public void Fluctuations_across_the_boundary_that_return_to_the_same_core_are_not_switches()
    {
        // A hand-made path of one species with cores x ≤ 9 and x ≥ 21 (the milestoning count: a transition is an entry into
        // the core of another mode than the one last visited; common practice, e.g. Faradjian & Elber 2004, J. Chem. Phys.
        // 120:10880, quoted from memory). A single threshold at 15 would count every crossing: 9 here.
        var network = AnalysisModels.Compile("species\n  X = 0\nreactions\n  make: 0 -> X mass 1\n  decay: X -> 0 mass 1\n");
        var watch = new ModeWatch(network, ModeCore.Parse("X=9..21", network));
        var counts = new long[] { 3 };
        watch.Start(counts);                               // low core from t = 0
        (double Time, long Count)[] path = [(1, 16), (2, 8), (3, 17), (4, 14), (5, 21), (6, 13), (7, 22), (8, 9), (9, 18)];
        foreach (var (time, count) in path) watch.Observe(0, count, time);
        var visits = watch.Finish(10).Span[0];
        // Entries into another core: high at t = 5, low at t = 8; the other visits to the boundary region return to the core they left.
        Assert.Equal((1L, 1L), (visits.ExitsLow, visits.ExitsHigh));
        Assert.Equal(2, visits.Switches);
        Assert.Equal(5.0 + 2.0, visits.TimeLow);          // [0, 5) and the censored [8, 10)
        Assert.Equal(3.0, visits.TimeHigh);               // [5, 8)
        Assert.Equal(0, visits.Final);
        Assert.Equal(0.0, visits.FirstEntry);
        var crossings = path.Prepend((0, 3L)).Zip(path, (a, b) => (a.Item2 < 15) != (b.Count < 15)).Count(c => c);
        Assert.True(crossings > visits.Switches, $"{crossings} crossings of a single threshold against {visits.Switches} switches");
    }

    [Fact]
    public void Threads_shards_and_their_combination_give_the_same_integers_as_one_run()
    {
        var network = AnalysisModels.Compile(Telegraph(KOn, KOff));
        var cores = GeneCores(network);
        var whole = Run(network, SimulationMethod.Direct, 5, 640, cores, threads: 1).ModeSwitching;
        Assert.Equal(whole, Run(network, SimulationMethod.Direct, 5, 640, cores, threads: 3).ModeSwitching);
        var combined = EnsembleResult.Combine(
            Run(network, SimulationMethod.Direct, 5, 640, cores, new Shard(2, 2)),
            Run(network, SimulationMethod.Direct, 5, 640, cores, new Shard(1, 2)));
        Assert.Equal(whole, combined.ModeSwitching);
        Assert.Equal(640, whole[0].Replicates);
    }

    [Fact]
    public void The_generated_loop_follows_the_modes_exactly_as_the_general_loop()
    {
        // A mass-action network the generated loop takes; the watched species changes in two reactions.
        var network = AnalysisModels.Compile("species\n  X = 30\nreactions\n  make: 0 -> X mass 20\n  decay: X -> 0 mass 1\n");
        var options = new SimulatorOptions { Modes = ModeCore.Parse("X=15..25", network) };
        var general = new DirectMethod<LinearSelection>(network, options, compiled: false);
        var compiled = new DirectMethod<LinearSelection>(network, options, compiled: true);
        var grid = new TimeGrid(50, 10);
        var observer = new Discard();
        for (var r = 0; r < 20; r++)
        {
            var a = ReplicateStreams.For(5, r);
            var b = ReplicateStreams.For(5, r);
            var expected = general.Run(ref a, grid, observer).Modes.Span[0];
            var actual = compiled.Run(ref b, grid, observer).Modes.Span[0];
            Assert.True(compiled.RunsCompiledLoop);
            Assert.Equal(expected, actual);
        }
    }

    [Fact]
    public void Cores_from_the_steady_states_of_the_toggle_are_a_quarter_of_the_way_between_them()
    {
        // The toggle's stable states solve u = (a/d)/(1 + (v/K)²), v = (a/d)/(1 + (u/K)²) with a/d = 30, K = 10 (the model's
        // comment); found here independently by bisection on g(u) = u − 30/(1 + (v(u)/10)²), v(u) = 30/(1 + (u/10)²), on [0, 12]
        // and [12, 30] (the saddle lies near 12.1).
        static double V(double u) => 30 / (1 + u / 10 * (u / 10));
        static double G(double u) => u - V(V(u));
        static double Root(double low, double high)
        {
            for (var i = 0; i < 200; i++)
            {
                var mid = (low + high) / 2;
                if (Math.Sign(G(mid)) == Math.Sign(G(low))) low = mid; else high = mid;
            }
            return (low + high) / 2;
        }
        var (uLow, uHigh) = (Root(0, 11.5), Root(13, 30));
        var network = ModelLoader.LoadText(File.ReadAllText(CliRun.Scenario("toggle_pair.cnet")), "toggle_pair.cnet").Model!.Network;
        var cores = SwitchingCores.Find(network);
        var quarter = (uHigh - uLow) / 4;
        var expected = $"U={Math.Floor(uLow + quarter)}..{Math.Ceiling(uHigh - quarter)},V={Math.Floor(uLow + quarter)}..{Math.Ceiling(uHigh - quarter)}";
        Assert.Equal(expected, ModeCore.Text(cores));
        // A monostable network gets none.
        Assert.Empty(SwitchingCores.Find(AnalysisModels.Compile("species\n  X = 0\nreactions\n  make: 0 -> X mass 10\n  decay: X -> 0 mass 1\n")));
    }

    [Theory]
    [InlineData("U=5", "is not NAME=LOW..HIGH")]
    [InlineData("U=9..9", "must lie below")]
    [InlineData("W=1..9", "'W' is not a species")]
    [InlineData("U=1..9,U=2..8", "given cores twice")]
    [InlineData("U=-1..9", "is not NAME=LOW..HIGH")]
    public void Bad_cores_are_refused_with_the_reason(string text, string reason)
    {
        var network = AnalysisModels.Compile("species\n  U = 0\n  V = 0\nreactions\n  make: 0 -> U mass 1\n  other: 0 -> V mass 1\n");
        Assert.Contains(reason, Assert.Throws<ArgumentException>(() => ModeCore.Parse(text, network)).Message);
    }

    [Fact]
    public void Shards_with_the_same_cores_merge_whether_the_cores_were_given_or_taken_from_the_steady_states()
    {
        // The toggle's default cores come from its stable steady states (U=9..21,V=9..21); a shard given the same cores by
        // option ran the same replicates the same way, so the merge must accept it and carry the counts of one run.
        using var scratch = new ScratchFolder();
        var model = CliRun.Scenario("toggle_pair.cnet");
        string[] Simulate(string folder, params string[] extra) =>
            ["simulate", model, "--until", "20", "--every", "5", "--replicates", "256", "--seed", "4", "--method", "direct",
                "--no-contrast", "--check-exact", "false", "--out", folder, .. extra];
        var whole = scratch.File("whole");
        Assert.Equal(0, CliRun.Of(Simulate(whole)).ExitCode);
        var first = scratch.File("first");
        Assert.Equal(0, CliRun.Of(Simulate(first, "--shard", "1/2")).ExitCode);
        var second = scratch.File("second");
        Assert.Equal(0, CliRun.Of(Simulate(second, "--shard", "2/2", "--switching", "U=9..21,V=9..21")).ExitCode);
        var merged = scratch.File("merged");
        var merge = CliRun.Of(["merge", first, second, "--out", merged]);
        Assert.True(merge.ExitCode == 0, merge.Error);
        string Field(string folder)
        {
            using var manifest = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, RunFiles.Manifest)));
            return manifest.RootElement.GetProperty(ManifestFields.ModeSwitching).GetRawText();
        }
        Assert.Equal(Field(whole), Field(merged));
    }

    [Fact]
    public void Shards_merged_on_the_command_line_carry_the_counts_of_one_run()
    {
        using var scratch = new ScratchFolder();
        var model = scratch.File("telegraph.cnet");
        File.WriteAllText(model, Telegraph(KOn, KOff));
        string[] Simulate(string folder, params string[] extra) =>
            ["simulate", model, "--until", "10", "--every", "1", "--replicates", "300", "--seed", "9", "--method", "direct",
                "--switching", "gene_on=0..1", "--no-contrast", "--check-exact", "false", "--out", folder, .. extra];
        var whole = scratch.File("whole");
        var run = CliRun.Of(Simulate(whole));
        Assert.True(run.ExitCode == 0, run.Error);
        Assert.Contains("switching of gene_on (low core ≤ 0, high core ≥ 1, as given)", run.Output);
        Assert.True(File.Exists(Path.Combine(whole, RunFiles.Switching)));
        var shards = new[] { "1/2", "2/2" }.Select((s, i) =>
        {
            var folder = scratch.File($"shard-{i}");
            Assert.Equal(0, CliRun.Of(Simulate(folder, "--shard", s)).ExitCode);
            return folder;
        }).ToArray();
        var merged = scratch.File("merged");
        var merge = CliRun.Of(["merge", shards[1], shards[0], "--out", merged]);
        Assert.True(merge.ExitCode == 0, merge.Error);
        string Field(string folder)
        {
            using var manifest = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, RunFiles.Manifest)));
            return manifest.RootElement.GetProperty(ManifestFields.ModeSwitching).GetRawText();
        }
        Assert.Equal(Field(whole), Field(merged));
        // The stored sums read back into the numbers the run computed.
        var network = AnalysisModels.Compile(Telegraph(KOn, KOff));
        var loaded = Assert.Single(StoredRun.Open(merged).Load(network).ModeSwitching);
        Assert.Equal(300, loaded.Replicates);
        Assert.Equal(Run(network, SimulationMethod.Direct, 10, 300, GeneCores(network), seed: 9, every: 1).ModeSwitching[0], loaded);
    }

    [Fact]
    public void An_interrupted_run_resumed_carries_the_counts_of_the_uninterrupted_run()
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("telegraph.cnet");
        File.WriteAllText(path, Telegraph(KOn, KOff));
        var model = ModelLoader.Load(path).Model!;
        Runs.SimulationOutcome Simulate(string folder, bool resume, CancellationToken cancel, Action<long>? blockFinished = null)
        {
            var specification = new Runs.RunSpecification
            {
                Model = model, Grid = new TimeGrid(5, 0.5), Replicates = 1000, Seed = 21, MethodRequested = "direct", Threads = 1,
                Switching = "gene_on=0..1", SwitchingSource = "option",
            };
            var request = new Runs.SimulationRequest(Runs.RunPlan.Make(specification), folder) { Resume = resume };
            return Runs.SimulationRun.Execute(request, new EnsembleMonitor { BlockFinished = blockFinished }, cancel);
        }
        var whole = Directory.CreateDirectory(scratch.File("whole")).FullName;
        Simulate(whole, resume: false, CancellationToken.None);
        var resumed = Directory.CreateDirectory(scratch.File("resumed")).FullName;
        using (var cancel = new CancellationTokenSource())
            Assert.Equal(StopReason.Interrupted, Simulate(resumed, false, cancel.Token, block => { if (block == 3) cancel.Cancel(); }).StopReason);
        var partial = Assert.Single(StoredRun.Open(resumed).Load(model.Network).ModeSwitching);
        Assert.InRange(partial.Replicates, 64, 999);
        Assert.Equal(StopReason.Finished, Simulate(resumed, true, CancellationToken.None).StopReason);
        Assert.Equal(StoredRun.Open(whole).Load(model.Network).ModeSwitching, StoredRun.Open(resumed).Load(model.Network).ModeSwitching);
        Resilience.RunFolders.AssertSameCells(whole, resumed, RunFiles.Switching);
    }

    private sealed class Discard : ITrajectoryObserver
    {
        public void Record(int gridIndex, double time, long[] counts, double[] parameters)
        {
        }
    }
}
