using System.Globalization;
using System.Text;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;
using CopyNumber.Stochastic.Locality;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Composition–rejection on the packed, renumbered layout against the same method on the user's numbering
/// (<see cref="DirectMethod{TSelection}"/> with <see cref="CompositionRejection"/>), which is the reference:
/// the layout only moves data in memory, so for the same stream the trajectories must agree to the bit —
/// every count at every grid time in the user's species order, the event count, the stream left behind —
/// and so must the messages of a failed run (common practice for a specialised code path: the general one
/// is its oracle). The law itself is checked against exact results by the exact-method tests
/// (DSMTS, birth–death, dimerisation), which run composition–rejection through the factory, i.e. on this layout.
/// </summary>
public class PackedLayoutTests
{
    [Fact]
    public void Every_bundled_scenario_it_accepts_gives_the_reference_trajectories()
    {
        var accepted = SameTrajectories.CheckBundledScenarios(
            network => PackedCompositionRejection.RefusalFor(network) is null,
            (network, grid, replicates, seed) => AssertSameTrajectories(network, grid, replicates, seed, new SimulatorOptions()));
        // Plain mass action, with a two-state promoter (switch counts) and a homodimer; without them the test would check little.
        Assert.Contains("promoter_switch.cnet", accepted);
        Assert.Contains("repressor_dimer.cnet", accepted);
    }

    [Theory]
    [MemberData(nameof(SameTrajectories.RandomSeeds), MemberType = typeof(SameTrajectories))]
    public void Random_mass_action_networks_give_the_reference_trajectories(int seed)
    {
        var random = new Random(seed);
        // 30–60 species and 60–150 reactions: the renumbering is far from the identity.
        var text = CompiledLoopTests.RandomNetwork(random, minSpecies: 30, maxSpecies: 60, minReactions: 60, maxReactions: 150);
        var network = ModelLoader.LoadText(text, $"random{seed}.cnet").Model?.Network
            ?? throw new InvalidOperationException("the random network did not compile:\n" + text);
        Assert.Null(PackedCompositionRejection.RefusalFor(network));
        AssertSameTrajectories(network, new TimeGrid(10, 0.25), replicates: 10, seed: (ulong)seed, new SimulatorOptions(MaxEvents: 50_000));
    }

    [Theory]
    [MemberData(nameof(SameTrajectories.RandomSeeds), MemberType = typeof(SameTrajectories))]
    public void Random_networks_with_broad_reactions_give_the_reference_trajectories(int seed)
    {
        // 2–8 species and 100–300 reactions: species read by dozens of reactions, so some reactions' updates
        // are gathered at each firing (DependencyGraph.IsBroad) rather than listed.
        var random = new Random(1000 + seed);
        var text = CompiledLoopTests.RandomNetwork(random, minSpecies: 2, maxSpecies: 8, minReactions: 100, maxReactions: 300);
        var network = ModelLoader.LoadText(text, $"broad{seed}.cnet").Model?.Network
            ?? throw new InvalidOperationException("the random network did not compile:\n" + text);
        Assert.Contains(Enumerable.Range(0, network.Stoichiometry.ReactionCount), j => network.Dependencies.IsBroad(j));
        Assert.Null(PackedCompositionRejection.RefusalFor(network));
        AssertSameTrajectories(network, new TimeGrid(2, 0.1), replicates: 5, seed: (ulong)seed, new SimulatorOptions(MaxEvents: 20_000));
    }

    [Fact]
    public void Scheduled_parameter_and_count_changes_give_the_reference_trajectories()
    {
        // Parameter changes make the constants change mid-run, and q above 10^290 makes 'zz' leave the
        // unimolecular updates that need no check (it reads Z = 0, so its propensity stays 0); count changes
        // are applied to the user's counts between segments.
        var text = new StringBuilder("species\n  Z = 0\n");
        for (var i = 0; i < 12; i++) text.Append(CultureInfo.InvariantCulture, $"  S{i} = {10 + 3 * i}\n");
        text.Append("parameters\n  k = 0.5\n  q = 1\nreactions\n  zz: Z -> S1 mass q\n");
        for (var i = 0; i < 12; i++)
        {
            text.Append(CultureInfo.InvariantCulture, $"  f{i}: S{i} -> S{(i * 5 + 1) % 12} mass k\n");
            text.Append(CultureInfo.InvariantCulture, $"  g{i}: S{i} + S{(i * 7 + 3) % 12} -> S{(i + 2) % 12} + S{i} mass 0.01\n");
        }
        text.Append("changes\n  k = 2 at time 2.5\n  S5 = S5 + 40 at time 4\n  q = 1e291 at time 6\n  q = 0.3 at time 6.5\n");
        var network = ModelLoader.LoadText(text.ToString(), "changes.cnet").Model!.Network;
        Assert.Null(PackedCompositionRejection.RefusalFor(network));
        AssertSameTrajectories(network, new TimeGrid(10, 0.1), replicates: 10, seed: 5, new SimulatorOptions(MaxEvents: 200_000));
    }

    [Fact]
    public void Parameters_set_per_replicate_give_the_reference_trajectories()
    {
        // As an ensemble with parameters drawn per cell does: each replicate starts from its own values, so the
        // constants (and with q above 10^290 the order of the unchecked updates) change between replicates.
        var network = ModelLoader.LoadText(
            "species\n  A = 30\n  B = 5\n  Z = 0\nparameters\n  k = 1\n  q = 1\nreactions\n  make: 0 -> A mass k\n  pair: A + B -> 2 B mass 0.01\n" +
            "  lose: B -> 0 mass 0.5\n  back: B -> A mass 0.2\n  zz: Z -> A mass q\n", "cells.cnet").Model!.Network;
        Assert.Null(PackedCompositionRejection.RefusalFor(network));
        var options = new SimulatorOptions();
        var reference = new DirectMethod<CompositionRejection>(network, options);
        var packed = new PackedCompositionRejection(network, options);
        for (var r = 0; r < 8; r++)
        {
            double[] start = [0.5 + r, r % 3 == 2 ? 1e291 : 1.0 + r];
            reference.StartFrom(start);
            packed.StartFrom(start);
            SameTrajectories.Check(reference, packed, new TimeGrid(20, 0.5), replicates: 1, seed: (ulong)(40 + r));
        }
    }

    [Fact]
    public void A_failed_run_says_the_same_as_the_reference_in_the_users_numbering()
    {
        // grow's propensity 10^290·A·X with A = 2^53 passes the largest double when X reaches 20, about 19
        // firings in: the run stops with a message naming the reaction and the counts. Other reactions come
        // first so that the renumbering moves A, X and 'grow' away from their user indices.
        var text = new StringBuilder("species\n");
        for (var i = 0; i < 6; i++) text.Append(CultureInfo.InvariantCulture, $"  B{i} = 50\n");
        text.Append("  A = 9007199254740992\n  X = 1\nreactions\n");
        for (var i = 0; i < 6; i++) text.Append(CultureInfo.InvariantCulture, $"  r{i}: B{i} -> B{(i + 1) % 6} mass 1\n");
        text.Append("  grow: A + X -> A + 2 X mass 1e290\n");
        var network = ModelLoader.LoadText(text.ToString(), "overflow.cnet").Model!.Network;
        Assert.Null(PackedCompositionRejection.RefusalFor(network));
        var options = new SimulatorOptions();
        var expected = Assert.Throws<SimulationFailureException>(() => Run(new DirectMethod<CompositionRejection>(network, options), 3));
        var actual = Assert.Throws<SimulationFailureException>(() => Run(new PackedCompositionRejection(network, options), 3));
        Assert.Contains("'grow'", expected.Message);
        Assert.Equal(expected.Message, actual.Message);
    }

    [Fact]
    public void Networks_outside_its_case_are_refused_with_the_reason()
    {
        // Negative control: what the packed loop cannot evaluate goes to the reference.
        Assert.Contains("mass action", PackedCompositionRejection.RefusalFor(
            ModelLoader.LoadText("species\n  X = 0\nreactions\n  make: 0 -> X rate 5 / (1 + X)\n", "t.cnet").Model!.Network));
        Assert.IsType<PackedCompositionRejection>(SimulatorFactory.Create(SimulationMethod.CompositionRejection,
            ModelLoader.LoadText("species\n  X = 0\nreactions\n  make: 0 -> X mass 5\n  lose: X -> 0 mass 1\n", "t.cnet").Model!.Network, new SimulatorOptions()));
    }

    private static void Run(IStochasticSimulator simulator, ulong seed)
    {
        var rng = new Xoshiro256StarStar(seed);
        simulator.Run(ref rng, new TimeGrid(10, 1), new SameTrajectories.Recording());
    }

    private static void AssertSameTrajectories(ReactionNetwork network, TimeGrid grid, int replicates, ulong seed, SimulatorOptions options) =>
        SameTrajectories.Check(new DirectMethod<CompositionRejection>(network, options), new PackedCompositionRejection(network, options), grid, replicates, seed);
}
