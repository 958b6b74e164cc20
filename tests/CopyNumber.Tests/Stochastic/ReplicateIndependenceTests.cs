using System.Globalization;
using System.Text;
using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// A replicate's trajectory depends on its own stream only, not on the replicates the same simulator ran
/// before it: an ensemble hands blocks of replicates to whichever thread is free, so anything a simulator
/// carried from one replicate to the next would make results depend on the number of threads and on timing
/// (the project's rule: bit-identical across threads, shards and resume). Checked on a ring of 80 reactions
/// with equal rate constants, where composition–rejection's groups hold many members, so the order of a
/// group's member list — the history it used to carry — decides which reaction the rejection step picks.
/// </summary>
public class ReplicateIndependenceTests
{
    [Theory]
    [MemberData(nameof(Simulators.ExactMethods), MemberType = typeof(Simulators))]
    public void A_replicate_is_the_same_on_a_fresh_simulator_and_after_others(SimulationMethod method)
    {
        var text = new StringBuilder("species\n");
        for (var i = 0; i < 40; i++) text.Append(CultureInfo.InvariantCulture, $"  S{i} = 20\n");
        text.Append("reactions\n");
        for (var i = 0; i < 40; i++)
        {
            text.Append(CultureInfo.InvariantCulture, $"  f{i}: S{i} -> S{(i + 1) % 40} mass 1\n");
            text.Append(CultureInfo.InvariantCulture, $"  g{i}: S{i} + S{(i * 7 + 3) % 40} -> S{(i + 2) % 40} + S{(i * 7 + 3) % 40} mass 0.01\n");
        }
        var network = ModelLoader.LoadText(text.ToString(), "ring.cnet").Model!.Network;
        var grid = new TimeGrid(5, 0.5);
        var fresh = Simulators.Create(method, network, new SimulatorOptions());
        var used = Simulators.Create(method, network, new SimulatorOptions());
        for (var earlier = 0UL; earlier < 3; earlier++)
        {
            var other = new Xoshiro256StarStar(1000 + earlier);
            used.Run(ref other, grid, new SameTrajectories.Recording());
        }
        var expected = new SameTrajectories.Recording();
        var actual = new SameTrajectories.Recording();
        var rngFresh = new Xoshiro256StarStar(7);
        var rngUsed = new Xoshiro256StarStar(7);
        Assert.Equal(fresh.Run(ref rngFresh, grid, expected).Events, used.Run(ref rngUsed, grid, actual).Events);
        Assert.Equal(expected.Rows, actual.Rows);
    }
}
