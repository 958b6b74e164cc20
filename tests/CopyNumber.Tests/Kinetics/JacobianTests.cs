using CopyNumber.Network;
using CopyNumber.Tests.Network;

namespace CopyNumber.Tests.Kinetics;

// The exact Jacobian J = N·∂v/∂x of the compiled rate equations against central finite differences of
// dx/dt = N·v(x) (common practice), tolerance from the step size (FiniteDifference.Tolerance).
public class JacobianTests
{
    private static void AssertJacobianMatchesDifferences(ReactionNetwork network, double[] x)
    {
        var (parameters, constants) = network.InitialKinetics();
        var species = network.Species.Count;
        var reactions = network.Reactions.Count;
        var jacobian = new double[species, species];
        network.RateEquations.Jacobian(x, constants, parameters, new double[reactions, species], jacobian);

        var anyNonZero = false;
        for (var row = 0; row < species; row++)
        {
            double Component(double[] state)
            {
                var dxdt = new double[species];
                network.RateEquations.Derivative(state, constants, parameters, new double[reactions], dxdt);
                return dxdt[row];
            }
            for (var column = 0; column < species; column++)
            {
                FiniteDifference.AssertMatches(jacobian[row, column], Component, x, column);
                anyNonZero |= jacobian[row, column] != 0;
            }
        }
        Assert.True(anyNonZero);
    }

    [Fact]
    public void Mass_action_jacobian_matches_differences()
    {
        var network = new SyntaxBuilder(size: 3)
            .Species("A", 0).Species("B", 0).Species("C", 0)
            .Mass("feed", "0 -> A", "2")
            .Mass("decay", "A -> 0", "0.4")
            .Mass("bind", "A + B -> C", "0.3")
            .Mass("dimer", "2 B -> C", "0.2")
            .Mass("mixed", "A + 2 C -> 3 B", "0.05")
            .Reversible("swap", "C <-> 2 A", "0.6", "0.1")
            .Compile();
        AssertJacobianMatchesDifferences(network, [4.1, 2.7, 5.3]);
        AssertJacobianMatchesDifferences(network, [0.9, 8.2, 1.4]);
    }

    [Fact]
    public void Dimerisation_jacobian_is_minus_four_k_x_for_the_monomer()
    {
        // 2 A -> B, Ω = 1: dA/dt = −2k·A², so ∂(dA/dt)/∂A = −4k·A and ∂(dB/dt)/∂A = 2k·A (by hand)
        var network = new SyntaxBuilder().Species("A", 0).Species("B", 0).Mass("d", "2 A -> B", "0.25").Compile();
        var constants = network.ConstantsFor([]);
        var jacobian = new double[2, 2];
        network.RateEquations.Jacobian([6.0, 1.0], constants, [], new double[1, 2], jacobian);
        Assert.Equal(-4 * 0.25 * 6.0, jacobian[0, 0], 14);
        Assert.Equal(2 * 0.25 * 6.0, jacobian[1, 0], 14);
        Assert.Equal(0.0, jacobian[0, 1]);
    }

    [Fact]
    public void Rate_law_jacobian_matches_differences()
    {
        var network = new SyntaxBuilder(size: 2)
            .Species("M", 0).Species("P", 0).Species("R", 0)
            .Parameter("v", "8").Parameter("K", "5").Parameter("n", "2.4").Parameter("Km", "3")
            .Rate("transcribe", "0 -> M", "v*hill_rep(R, K, n) + 0.1*hill_act(P, K, 2)")
            .Rate("translate", "M -> M + P", "2*mm(M, Km)*pow(P + 1, 0.5)")
            .Rate("export", "P -> R", "exp(-0.1*R)*log(1 + P)")
            .Rate("cap", "R -> 0", "min(R, 2*M) + max(0.5*P, K)")
            .Rate("leak", "P -> 0", "abs(P - R)*sqrt(M)/(1 + M^2)")
            .Mass("decay", "M -> 0", "0.3")
            .Compile();
        AssertJacobianMatchesDifferences(network, [3.3, 7.9, 2.2]);
        AssertJacobianMatchesDifferences(network, [9.6, 1.4, 6.1]);
    }
}
