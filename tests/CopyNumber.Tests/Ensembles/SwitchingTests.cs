using System.Text.Json;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Storage;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Analysis;
using CopyNumber.Tests.Cli;
using CopyNumber.Tests.Storage;
using CopyNumber.Tests.Stochastic;

namespace CopyNumber.Tests.Ensembles;

/// <summary>The per-replicate transition count of species the model confines to 0 and 1.</summary>
public sealed class SwitchingTests
{
    private static string Telegraph(double kOn, double kOff, string schedule = "") =>
        $"species\n  gene_off = 1\n  gene_on = 0\nparameters\n  k_on = {kOn}\n  k_off = {kOff}\n" +
        "reactions\n  activate: gene_off -> gene_on mass k_on\n  deactivate: gene_on -> gene_off mass k_off\n" +
        (schedule.Length > 0 ? "changes\n" + schedule : "");

    private static EnsembleResult Run(ReactionNetwork network, SimulationMethod method, double until, long replicates, Shard? shard = null) =>
        EnsembleRunner.Run(network, new EnsembleOptions
        {
            Grid = new TimeGrid(until, until / 4), Replicates = replicates, Seed = 41, Threads = 2, Method = method, Shard = shard ?? Shard.Whole,
        });

    /// <summary>
    /// Two-state Markov chain off ⇄ on (rates k_on, k_off), started off: P_on(t) = k_on/s·(1 − e^(−st)),
    /// s = k_on + k_off, and switches occur at rate k_on·P_off(t) + k_off·P_on(t), so the expected number
    /// over [0, T] is ∫ (k_on + (k_off − k_on)·P_on) dt = k_on·T + (k_off − k_on)·(k_on/s)·(T − (1 − e^(−sT))/s)
    /// (common practice; the textbook two-state chain, e.g. Karlin &amp; Taylor 1975, A First Course in
    /// Stochastic Processes; quoted from memory).
    /// </summary>
    private static double ExpectedSwitches(double kOn, double kOff, double until)
    {
        var s = kOn + kOff;
        return kOn * until + (kOff - kOn) * (kOn / s) * (until - (1 - Math.Exp(-s * until)) / s);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void The_telegraph_gene_switches_as_often_as_the_two_state_chain_says(SimulationMethod method)
    {
        const double kOn = 0.5, kOff = 1.5, until = 10;
        var network = AnalysisModels.Compile(Telegraph(kOn, kOff));
        var result = Run(network, method, until, replicates: 4000);
        Assert.Equal(["gene_off", "gene_on"], result.Switching.Select(s => s.Species));
        var expected = ExpectedSwitches(kOn, kOff, until); // 7.375
        foreach (var switching in result.Switching)
        {
            Assert.Equal(4000, switching.Replicates);
            Assert.Equal(0, switching.Excluded);
            Assert.Equal(until, switching.Span);
            // Five standard errors of the mean, from the sample's own variance: a false failure has
            // probability below 10⁻⁶ (normal approximation, 4000 replicates).
            Assert.True(Math.Abs(switching.Mean - expected) <= 5 * switching.StandardError,
                $"{method}: {switching.Mean} ± {switching.StandardError} switches of {switching.Species}, expected {expected}");
        }
        // Every switch moves both species: the two counts are the same numbers.
        Assert.Equal(result.Switching[0].Sum, result.Switching[1].Sum);
        Assert.Equal(result.Switching[0].SumOfSquares, result.Switching[1].SumOfSquares);
    }

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void Schedule_flips_after_time_zero_count_and_the_initial_ones_do_not(SimulationMethod method)
    {
        // Nothing fires (rates 0): the gene is switched on at 0 (the initial state), off at 2.5 and on at 3.
        var network = AnalysisModels.Compile(Telegraph(0, 0,
            "  gene_on = 1  at time 0\n  gene_off = 0  at time 0\n  gene_on = 0  at time 2.5\n  gene_off = 1  at time 2.5\n  gene_on = 1  at time 3\n  gene_off = 0  at time 3\n"));
        var result = Run(network, method, until: 4, replicates: 10);
        foreach (var switching in result.Switching)
        {
            Assert.Equal(2.0, switching.Mean);
            Assert.Equal(0.0, switching.Variance);
        }
    }

    [Fact]
    public void A_schedule_that_breaks_the_confining_law_leaves_the_replicates_out()
    {
        // Setting gene_on = 1 while gene_off is 1 (nothing fires) makes gene_off + gene_on = 2, under which
        // gene_on could reach 2: no replicate's count of either species is a count of 0/1 switches.
        var network = AnalysisModels.Compile(Telegraph(0, 0, "  gene_on = 1  at time 2\n"));
        var result = Run(network, SimulationMethod.Direct, until: 4, replicates: 20);
        Assert.All(result.Switching, s => Assert.Equal((0L, 20L), (s.Replicates, s.Excluded)));
        Assert.True(double.IsNaN(result.Switching[0].Mean));
    }

    [Fact]
    public void Only_species_confined_to_zero_and_one_are_counted()
    {
        // X (immigration) is unbounded; A + B = 2 allows A = 2; gene_off + gene_on + gene_bound = 1 confines all three.
        var network = AnalysisModels.Compile(
            "species\n  X = 0\n  A = 1\n  B = 1\n  gene_off = 1\n  gene_on = 0\n  gene_bound = 0\n" +
            "reactions\n  make: 0 -> X mass 1\n  flip: A -> B mass 1\n  flop: B -> A mass 1\n" +
            "  on: gene_off -> gene_on mass 1\n  bind: gene_on -> gene_bound mass 1\n  release: gene_bound -> gene_off mass 1\n");
        Assert.Equal(["gene_off", "gene_on", "gene_bound"], TwoStateSpecies.Of(network).Species.Select(i => network.Species[i]));
        var none = AnalysisModels.Compile("species\n  X = 0\nreactions\n  make: 0 -> X mass 1\n  decay: X -> 0 mass 1\n");
        Assert.Empty(Run(none, SimulationMethod.Direct, until: 1, replicates: 10).Switching);
    }

    [Fact]
    public void Shards_combine_into_exactly_the_whole_run()
    {
        var network = AnalysisModels.Compile(Telegraph(0.5, 1.5));
        var whole = Run(network, SimulationMethod.Direct, until: 5, replicates: 640);
        var combined = EnsembleResult.Combine(
            Run(network, SimulationMethod.Direct, until: 5, replicates: 640, new Shard(1, 2)),
            Run(network, SimulationMethod.Direct, until: 5, replicates: 640, new Shard(2, 2)));
        Assert.Equal(whole.Switching, combined.Switching);
    }

    [Fact]
    public void The_manifest_records_the_switching_and_a_stored_run_reads_it_back()
    {
        using var scratch = new ScratchFolder();
        var path = scratch.File("telegraph.cnet");
        File.WriteAllText(path, Telegraph(0.5, 1.5));
        var folder = scratch.File("run");
        var run = CliRun.Of("simulate", path, "--until", "10", "--every", "1", "--replicates", "300", "--seed", "9", "--method", "direct", "--out", folder);
        Assert.True(run.ExitCode == 0, run.Error);
        using var manifest = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, "manifest.json")));
        var entries = manifest.RootElement.GetProperty("switching").EnumerateArray().ToArray();
        Assert.Equal(["gene_off", "gene_on"], entries.Select(e => e.GetProperty("species").GetString()));
        Assert.Equal(300, entries[1].GetProperty("replicates").GetInt64());
        var loaded = StoredRun.Open(folder).Load(AnalysisModels.Compile(Telegraph(0.5, 1.5))).Switching;
        Assert.Equal(entries[1].GetProperty("switches_sum").GetInt64(), loaded[1].Sum);
        Assert.Equal(entries[1].GetProperty("mean").GetDouble(), loaded[1].Mean);
    }
}
