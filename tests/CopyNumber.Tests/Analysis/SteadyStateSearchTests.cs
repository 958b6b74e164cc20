using CopyNumber.Analysis.SteadyStates;
using CopyNumber.Network;

namespace CopyNumber.Tests.Analysis;

public class SteadyStateSearchTests
{
    // The Brusselator (Prigogine & Lefever 1968, J. Chem. Phys. 48:1695): 0 -> X (a), X -> Y (b), 2X + Y -> 3X (1),
    // X -> 0 (1). Rate equations dx/dt = a − (b + 1)x + x²y, dy/dt = bx − x²y; one steady state (a, b/a), stable
    // for b < 1 + a² and surrounded by a limit cycle for b > 1 + a² (Hopf; common textbook result).
    private static ReactionNetwork Brusselator(double b) => ModelLoader.LoadText(
        $"# illustrative\nspecies\n  X = 1\n  Y = 1\nparameters\n  a = 1\n  b = {b}\nreactions\n  feed: 0 -> X mass a\n  convert: X -> Y mass b\n  autocatalysis: 2 X + Y -> 3 X mass 1\n  drain: X -> 0 mass 1\n",
        "brusselator.cnet").Model!.Network;

    [Fact]
    public void Below_the_Hopf_point_the_one_steady_state_is_found_stable_and_above_it_a_limit_cycle_is_never_counted()
    {
        var stable = SteadyStateSearch.Find(Brusselator(1.5));
        var state = Assert.Single(stable.Stable);
        Assert.Equal(1.0, state.State[0], 6);
        Assert.Equal(1.5, state.State[1], 6);
        Assert.Equal(0, stable.Unsettled);

        var cycling = SteadyStateSearch.Find(Brusselator(3));
        Assert.Empty(cycling.Stable);
        Assert.Equal(cycling.Starts, cycling.Unsettled); // every start ends on the cycle, none settles
    }

    [Fact]
    public void A_conservation_law_keeps_the_starts_in_the_initial_class_and_the_state_is_the_exact_one()
    {
        // A <-> B (k1 = 2, k2 = 1) with A + B = 30: the one steady state in the class is A = 10, B = 20 (detailed balance).
        var network = ModelLoader.LoadText("# illustrative\nspecies\n  A = 30\n  B = 0\nreactions\n  flip: A -> B mass 2\n  flop: B -> A mass 1\n", "iso.cnet").Model!.Network;
        var result = SteadyStateSearch.Find(network);
        var state = Assert.Single(result.Stable);
        Assert.Equal(10, state.State[0], 6);
        Assert.Equal(20, state.State[1], 6);
        Assert.True(state.LargestRealPart < 0);
    }
}
