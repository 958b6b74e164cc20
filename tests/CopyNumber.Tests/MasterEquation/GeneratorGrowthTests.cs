using CopyNumber.MasterEquation;
using CopyNumber.Network;

namespace CopyNumber.Tests.MasterEquation;

/// <summary>
/// A grown projection's generator derived incrementally (<see cref="Generator.Extend"/>) against the generator built from
/// scratch on the same states: an incremental update must equal the full recomputation (common practice), here entry for
/// entry and bit for bit, since the solver's results must not depend on how the projection grew.
/// </summary>
public class GeneratorGrowthTests
{
    // Illustrative: two genes repressing each other (Hill functions), with decay, as in the toggle scenario.
    private const string Toggle =
        "species\n  U = 5\n  V = 5\nparameters\n  a = 30\n  K = 10\n  n = 2\n  d = 1\n"
        + "reactions\n  make_u: 0 -> U rate a * hill_rep(V, K, n)\n  make_v: 0 -> V rate a * hill_rep(U, K, n)\n"
        + "  decay_u: U -> 0 mass d\n  decay_v: V -> 0 mass d\n";

    [Fact]
    public void A_generator_extended_over_added_states_equals_one_built_on_them_from_scratch()
    {
        var network = ModelLoader.LoadText(Toggle, "toggle.cnet").Model!.Network;
        var space = new StateSpace(StateCoding.For(network));
        for (var u = 0; u <= 12; u++)
            for (var v = 0; v <= 12; v++) space.Add([u, v]);
        var parameters = network.InitialParameterValues.ToArray();
        var constants = new double[network.Reactions.Count];
        network.Propensities.ComputeConstants(parameters, constants);
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = 2 };
        var generator = Generator.Build(space, network, constants, parameters, parallel);
        Assert.True(generator.Leak.Count(l => l > 0) > 0, "the first projection must leak, or there is nothing to extend");

        // Two growths, as the solver makes them: states appended next to the frontier, in no particular order.
        foreach (var ring in new[] { 13, 14 })
        {
            for (var k = ring; k >= 0; k--)
            {
                space.Add([ring, k]);
                if (k != ring) space.Add([k, ring]);
            }
            generator = generator.Extend(space, network, constants, parameters, parallel);
            var reference = Generator.Build(space, network, constants, parameters, parallel);
            Assert.Equal(reference.States, generator.States);
            Assert.Equal(reference.RowStart, generator.RowStart);
            Assert.Equal(reference.Source, generator.Source);
            Assert.Equal(reference.Rate.Select(BitConverter.DoubleToInt64Bits), generator.Rate.Select(BitConverter.DoubleToInt64Bits));
            Assert.Equal(reference.Exit.Select(BitConverter.DoubleToInt64Bits), generator.Exit.Select(BitConverter.DoubleToInt64Bits));
            Assert.Equal(reference.Leak.Select(BitConverter.DoubleToInt64Bits), generator.Leak.Select(BitConverter.DoubleToInt64Bits));
            Assert.Equal(reference.LeakReactions, generator.LeakReactions);
        }
        // The interior of the grown box no longer leaks: only the new frontier does.
        Assert.Equal(0, generator.Leak[space.IndexOf([12, 12])]);
        Assert.True(generator.Leak[space.IndexOf([14, 3])] > 0);
    }
}
