using System.Globalization;
using System.Text;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using CopyNumber.Stochastic.Compiled;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// The direct-method loop generated for a network against the general loop, which is the reference: for the
/// same stream they must give the same trajectory to the bit (every count at every grid time, the event
/// count, the event limit), because the generated code repeats the general loop's arithmetic in its order
/// (common practice for a specialised code path: the general one is its oracle).
/// </summary>
public class CompiledLoopTests
{
    [Fact]
    public void Every_bundled_scenario_it_accepts_gives_the_general_loops_trajectories()
    {
        var accepted = SameTrajectories.CheckBundledScenarios(
            network => CompiledDirectLoop.RefusalFor(network) is null && network.Stoichiometry.ReactionCount <= SimulatorFactory.LinearSelectionLimit,
            (network, grid, replicates, seed) => AssertSameTrajectories(network, grid, replicates, seed, new SimulatorOptions()));
        // The promoter and the repressor-dimer scenarios are plain mass action; without them the test would check nothing.
        Assert.Contains("promoter_switch.cnet", accepted);
        Assert.Contains("repressor_dimer.cnet", accepted);
    }

    [Theory]
    [MemberData(nameof(SameTrajectories.RandomSeeds), MemberType = typeof(SameTrajectories))]
    public void Random_mass_action_networks_give_the_general_loops_trajectories(int seed)
    {
        var random = new Random(seed);
        var text = RandomNetwork(random);
        var network = ModelLoader.LoadText(text, $"random{seed}.cnet").Model?.Network
            ?? throw new InvalidOperationException("the random network did not compile:\n" + text);
        Assert.Null(CompiledDirectLoop.RefusalFor(network));
        // A cap on events, so growing networks end at the same event limit in both loops (also compared).
        AssertSameTrajectories(network, new TimeGrid(10, 0.25), replicates: 10, seed: (ulong)seed, new SimulatorOptions(MaxEvents: 50_000));
    }

    [Fact]
    public void Networks_outside_the_plain_case_are_refused_with_the_reason()
    {
        // Negative control: what the generated loop would get wrong goes to the general loop.
        Assert.Equal("scheduled parameter changes",
            CompiledDirectLoop.RefusalFor(Load("species\n  X = 0\nparameters\n  k = 1\nreactions\n  make: 0 -> X mass k\nchanges\n  k = 2 at time 1\n")));
        Assert.Contains("mass action",
            CompiledDirectLoop.RefusalFor(Load("species\n  X = 0\nreactions\n  make: 0 -> X rate 5 / (1 + X)\n")));
        Assert.Null(CompiledDirectLoop.RefusalFor(Load("species\n  X = 0\nreactions\n  make: 0 -> X mass 5\nchanges\n  X = X + 3 at time 1\n")));
    }

    private static ReactionNetwork Load(string text) => ModelLoader.LoadText(text, "t.cnet").Model!.Network;

    private static void AssertSameTrajectories(ReactionNetwork network, TimeGrid grid, int replicates, ulong seed, SimulatorOptions options)
    {
        var general = new DirectMethod<LinearSelection>(network, options, compiled: false);
        var compiled = new DirectMethod<LinearSelection>(network, options, compiled: true);
        SameTrajectories.Check(general, compiled, grid, replicates, seed, () =>
        {
            Assert.True(compiled.RunsCompiledLoop, $"{network.Name}: the generated loop did not run");
            Assert.False(general.RunsCompiledLoop);
        });
    }

    /// <summary>
    /// A random mass-action network: <paramref name="minSpecies"/>–<paramref name="maxSpecies"/> species,
    /// <paramref name="minReactions"/>–<paramref name="maxReactions"/> reactions of every form the generated loop handles (0 →, X →, X + Y →, 2 X →, to 0, 1 or 2 product
    /// molecules), sometimes a scheduled change of a count.
    /// </summary>
    internal static string RandomNetwork(Random random, int minSpecies = 2, int maxSpecies = 8, int minReactions = 2, int maxReactions = 24)
    {
        var species = random.Next(minSpecies, maxSpecies + 1);
        var reactions = random.Next(minReactions, maxReactions + 1);
        var text = new StringBuilder("species\n");
        for (var i = 0; i < species; i++) text.Append(CultureInfo.InvariantCulture, $"  S{i} = {random.Next(0, 40)}\n");
        text.Append("reactions\n");
        string Side(int kind) => kind switch
        {
            0 => "0",
            1 => $"S{random.Next(species)}",
            2 => $"S{random.Next(species)} + S{random.Next(species)}",
            _ => $"2 S{random.Next(species)}",
        };
        for (var j = 0; j < reactions; j++)
        {
            var left = Side(random.Next(4));
            if (left.Contains('+'))
            {
                var parts = left.Split(" + ");
                if (parts[0] == parts[1]) left = "2 " + parts[0];
            }
            var right = Side(random.Next(4));
            if (right.Contains('+') && right.Split(" + ") is var p && p[0] == p[1]) right = "2 " + p[0];
            if (left == "0" && right == "0") right = "S0";
            var rate = Math.Round(random.NextDouble() * (left.Contains('+') || left.StartsWith('2') ? 0.05 : 2), 4) + 0.001;
            text.Append(CultureInfo.InvariantCulture, $"  r{j}: {left} -> {right} mass {rate.ToString("R", CultureInfo.InvariantCulture)}\n");
        }
        if (random.Next(2) == 0) text.Append(CultureInfo.InvariantCulture, $"changes\n  S0 = S0 + {random.Next(1, 20)} at time 3.3\n");
        return text.ToString();
    }
}
