using System.Runtime.CompilerServices;
using System.Text;
using CopyNumber.Network;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Networks whose dependency graph, stored reaction by reaction, would be quadratic: the graph stays linear
/// (it stores what it holds in entries that are counted, not timed), the walked updates are exactly the
/// dependency rule of Gibson &amp; Bruck (2000, J. Phys. Chem. A 104:1876) worked out here by brute force,
/// and the simulators stay exact on such "broad" reactions.
/// </summary>
public sealed class LargeNetworkMemoryTests
{
    /// <summary>S = 1000 and <paramref name="channels"/> reactions S → 0, each reading and changing S.</summary>
    internal static ReactionNetwork Star(int channels)
    {
        var text = new StringBuilder("species\n  S = 1000\nparameters\n  k = 0.001\nreactions\n");
        for (var j = 0; j < channels; j++) text.Append($"  r{j}: S -> 0 mass k\n");
        return Load(text.ToString(), "star.cnet");
    }

    /// <summary>A0 = 100 and the chain A0 → A1 → … → A<paramref name="links"/>, each step at rate 1.</summary>
    private static ReactionNetwork Chain(int links)
    {
        var text = new StringBuilder("species\n");
        for (var i = 0; i <= links; i++) text.Append($"  A{i} = {(i == 0 ? 100 : 0)}\n");
        text.Append("parameters\n  k = 1\nreactions\n");
        for (var j = 0; j < links; j++) text.Append($"  r{j}: A{j} -> A{j + 1} mass k\n");
        return Load(text.ToString(), "chain.cnet");
    }

    private static ReactionNetwork Load(string text, string file)
    {
        var loaded = ModelLoader.LoadText(text, file);
        Assert.Empty(loaded.Diagnostics);
        return loaded.Model!.Network;
    }

    [Fact]
    public void Twenty_thousand_reactions_reading_one_species_store_a_linear_graph()
    {
        const int reactions = 20_000;
        var graph = Star(reactions).Dependencies;
        // Stored per reaction, each of the 20 000 reactions would list all 20 000: 4·10⁸ entries.
        // Linear: row starts (reactions + 1 and species + 1 = 2), the one reader list (20 000) and no stored
        // affected list.
        Assert.Equal((reactions + 1) + 2 + reactions, graph.StoredEntries);
        Assert.Equal(reactions, graph.Readers(0).Length);
        for (var j = 0; j < reactions; j++)
        {
            Assert.True(graph.IsBroad(j));
            Assert.Equal(0, graph.Affected(j).Length);
        }
    }

    [Fact]
    public void Walked_updates_are_the_readers_of_the_changed_species()
    {
        // 40 reactions all read and change S (broad); others read S and T or T alone; T is changed by the
        // narrow ones. Brute force: reaction k is affected by j when k's law reads a species j changes.
        var text = new StringBuilder("species\n  S = 50\n  T = 50\n  U = 0\nparameters\n  k = 0.01\nreactions\n");
        for (var j = 0; j < 40; j++) text.Append($"  s{j}: S -> U mass k\n");
        text.Append("  both: S + T -> U mass k\n  t: T -> U mass k\n  back: U -> T mass k\n  make: 0 -> S rate k * T\n");
        var network = Load(text.ToString(), "mixed.cnet");
        var n = network.Stoichiometry;
        var reads = Enumerable.Range(0, n.ReactionCount)
            .Select(k => Enumerable.Range(0, n.SpeciesCount).Where(i => network.Dependencies.Readers(i).Contains(k)).ToHashSet()).ToArray();
        var state = new SimulatorState(network);
        var effects = new ReactionEffects(network, includeFired: false);
        var program = new FiringProgram(effects, state);
        var broad = 0;
        for (var j = 0; j < n.ReactionCount; j++)
        {
            var changed = n.ChangedSpecies(j).ToArray();
            var expected = Enumerable.Range(0, n.ReactionCount).Where(k => reads[k].Overlaps(changed)).ToArray();
            int[] actual;
            if (network.Dependencies.IsBroad(j))
            {
                broad++;
                ref var header = ref Unsafe.Add(ref program.Headers, j);
                program.CollectBroad(ref header, j);
                var collected = Enumerable.Range(header.UpdateStart, header.UpdateEnd - header.UpdateStart)
                    .Select(u => UpdateReaction(program, u)).ToArray();
                actual = collected.Order().ToArray();
                Assert.Equal(collected.Length, collected.Distinct().Count()); // each reaction once
            }
            else actual = network.Dependencies.Affected(j).ToArray();
            Assert.Equal(expected, actual);
        }
        // S has 41 readers (the 40 and 'both'): every reaction that changes S is past the bound of 32 — the
        // 40, 'both' and 'make'; 't' and 'back' change only T and U (3 + 1 readers) and keep stored lists.
        Assert.Equal(42, broad);
    }

    private static int UpdateReaction(FiringProgram program, int u) => Unsafe.Add(ref program.Updates, u).Reaction;

    [Theory]
    [MemberData(nameof(Simulators.AllMethods), MemberType = typeof(Simulators))]
    public void Broad_reactions_keep_the_immigration_death_law(SimulationMethod method)
    {
        // Immigration 0 → X at α and death split into 40 channels X → 0 at μ/40 each: every reaction
        // changes X, which 40 laws read, so all are broad. X(t) is Poisson with mean (α/μ)(1 − e^(−μt))
        // from X(0) = 0 (Bailey 1964, The Elements of Stochastic Processes, Wiley, immigration in
        // birth-and-death processes; quoted from memory), as in ImmigrationDeathTests.
        const double alpha = 8, mu = 0.5;
        const int channels = 40;
        var text = new StringBuilder($"species\n  X = 0\nparameters\n  alpha = {alpha}\n  mu = {mu / channels}\nreactions\n  in: 0 -> X mass alpha\n");
        for (var j = 0; j < channels; j++) text.Append($"  out{j}: X -> 0 mass mu\n");
        var network = Load(text.ToString(), "split.cnet");
        Assert.All(Enumerable.Range(0, channels + 1), j => Assert.True(network.Dependencies.IsBroad(j)));

        var grid = new TimeGrid(until: 6, every: 2);
        var samples = GridSamples.Run(network, method, grid, replicates: 10_000, seed: 2000);
        for (var k = 1; k < grid.Count; k++)
        {
            var lambda = alpha / mu * (1 - Math.Exp(-mu * grid[k]));
            var column = samples.Column(k, 0);
            SamplingChecks.MeanAgrees(column, lambda, lambda, $"{method}, t = {grid[k]}");
            SamplingChecks.FollowsDistribution(column, SamplingChecks.Poisson(lambda), $"{method}, t = {grid[k]}");
        }
    }

    [Theory]
    [MemberData(nameof(Simulators.ExactMethods), MemberType = typeof(Simulators))]
    public void A_chain_of_30000_reactions_compiles_and_runs(SimulationMethod method)
    {
        const int links = 30_000;
        var network = Chain(links);
        Assert.Equal(links + 1, network.Species.Count);
        var grid = new TimeGrid(until: 2, every: 1);
        var samples = GridSamples.Run(network, method, grid, replicates: 3, seed: 30);
        Assert.True(samples.Events > 0);
        // Every step moves one copy along the chain: the total stays 100 (common practice: N's columns sum to 0).
        for (var r = 0; r < 3; r++)
            Assert.Equal(100, Enumerable.Range(0, links + 1).Sum(i => samples.At(r, grid.Count - 1, i)));
    }

    [Theory]
    [MemberData(nameof(Simulators.ExactMethods), MemberType = typeof(Simulators))]
    public void Twenty_thousand_broad_reactions_run(SimulationMethod method)
    {
        // S → 0 through 20 000 channels at k = 0.001 each: total rate 20·S, so S(t) is Binomial(1000, e^(−20t))
        // (pure death; common practice). At t = 0.05 the mean is 1000/e.
        var network = Star(20_000);
        var grid = new TimeGrid(until: 0.05, every: 0.05);
        var samples = GridSamples.Run(network, method, grid, replicates: 20, seed: 20);
        var p = Math.Exp(-1);
        SamplingChecks.MeanAgrees(samples.Column(1, 0), 1000 * p, 1000 * p * (1 - p), $"{method}");
    }
}
