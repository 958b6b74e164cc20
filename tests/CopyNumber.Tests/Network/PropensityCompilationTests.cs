using CopyNumber.Kinetics;
using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

// Mass-action propensities against Gillespie (1977, J. Phys. Chem. 81:2340): with macroscopic constant
// k (concentration units), reactant stoichiometries ν_i and system size Ω,
//     a(x) = Ω·k·∏ ff(x_i, ν_i)/Ω^ν_i,   ff(x, ν) = x(x−1)…(x−ν+1),
// evaluated term by term below, independently of the compiled c = k·Ω^(1−order).
public class PropensityCompilationTests
{
    private const double Size = 2.5;

    private static double FallingFactorial(long x, long nu)
    {
        var result = 1.0;
        for (var q = 0; q < nu; q++) result *= x - q;
        return result;
    }

    private static double Gillespie(double k, double omega, params (long Count, long Nu)[] reactants) =>
        omega * k * reactants.Aggregate(1.0, (p, r) => p * FallingFactorial(r.Count, r.Nu) / Math.Pow(omega, r.Nu));

    private static ReactionNetwork AllForms() => new SyntaxBuilder(Size)
        .Species("A", 0).Species("B", 0).Species("C", 0)
        .Parameter("k0", "1.5").Parameter("k1", "0.7").Parameter("k2", "0.3")
        .Parameter("k3", "0.05").Parameter("k4", "0.02").Parameter("Km", "4")
        .Mass("source", "0 -> A", "k0")
        .Mass("decay", "A -> 0", "k1")
        .Mass("bind", "A + B -> C", "k2")
        .Mass("dimer", "2 A -> C", "k2")
        .Mass("trimer", "3 A -> C", "k3")
        .Mass("mixed", "A + 2 B -> C", "k4")
        .Rate("saturating", "C -> 0", "k1*C/(Km + C)")
        .Compile();

    [Fact]
    public void Each_form_is_chosen_from_the_reactant_list()
    {
        var p = AllForms().Propensities;
        PropensityForm[] expected =
        [
            PropensityForm.Constant, PropensityForm.Unimolecular, PropensityForm.Bimolecular, PropensityForm.Homodimer,
            PropensityForm.GeneralMassAction, PropensityForm.GeneralMassAction, PropensityForm.RateLaw,
        ];
        Assert.Equal(expected, Enumerable.Range(0, p.Count).Select(p.Form));
        Assert.Equal([0, 1, 2, 2, 3, 3, 1], Enumerable.Range(0, p.Count).Select(p.Order));
    }

    [Theory]
    [InlineData(7, 5, 3)]
    [InlineData(2, 1, 0)]
    [InlineData(1, 2, 9)]
    [InlineData(40, 33, 12)]
    public void Propensities_match_the_combinatorial_formula_at_size_not_one(long a, long b, long c)
    {
        var network = AllForms();
        var (parameters, constants) = network.InitialKinetics();
        long[] counts = [a, b, c];
        var actual = new double[network.Reactions.Count];
        network.Propensities.EvaluateAll(counts, constants, parameters, actual);

        double[] expected =
        [
            Gillespie(1.5, Size),
            Gillespie(0.7, Size, (a, 1)),
            Gillespie(0.3, Size, (a, 1), (b, 1)),
            Gillespie(0.3, Size, (a, 2)),
            Gillespie(0.05, Size, (a, 3)),
            Gillespie(0.02, Size, (a, 1), (b, 2)),
            0.7 * c / (4 + c), // a rate law is the propensity as written
        ];
        for (var j = 0; j < expected.Length; j++)
            Assert.Equal(expected[j], actual[j], 1e-12 * Math.Max(1, Math.Abs(expected[j])));
    }

    [Fact]
    public void Too_few_molecules_give_zero_propensity()
    {
        // ff(x, ν) = 0 for x < ν: two A cannot react as a trimer, one B cannot meet a second B
        var network = AllForms();
        var (parameters, constants) = network.InitialKinetics();
        long[] counts = [2, 1, 0];
        Assert.Equal(0.0, network.Propensities.Evaluate(4, counts, constants, parameters));
        Assert.Equal(0.0, network.Propensities.Evaluate(5, counts, constants, parameters));
    }

    [Fact]
    public void Rate_equations_use_omega_k_times_product_of_concentrations()
    {
        // v = Ω·k·∏ (x_i/Ω)^ν_i on a real state (the macroscopic limit of the same constants)
        var network = AllForms();
        var (parameters, constants) = network.InitialKinetics();
        double[] x = [6.4, 3.3, 2.2];
        var v = new double[network.Reactions.Count];
        network.RateEquations.Rates(x, constants, parameters, v);
        double Macro(double k, params (double X, int Nu)[] r) => Size * k * r.Aggregate(1.0, (p, t) => p * Math.Pow(t.X / Size, t.Nu));
        double[] expected =
        [
            Macro(1.5), Macro(0.7, (6.4, 1)), Macro(0.3, (6.4, 1), (3.3, 1)), Macro(0.3, (6.4, 2)),
            Macro(0.05, (6.4, 3)), Macro(0.02, (6.4, 1), (3.3, 2)), 0.7 * 2.2 / (4 + 2.2),
        ];
        for (var j = 0; j < expected.Length; j++)
            Assert.Equal(expected[j], v[j], 1e-12 * Math.Max(1, Math.Abs(expected[j])));
    }

    [Fact]
    public void Dimerisation_at_unit_size_has_propensity_k_x_x_minus_one_and_rate_minus_two_k_x_squared()
    {
        // 2 A -> B, mass k, Ω = 1: a = k·x(x−1) (Gillespie 1977) and dA/dt = −2k·A², dB/dt = k·A²
        // (the deterministic rate law of the same reaction; common practice)
        const double k = 0.25;
        var network = new SyntaxBuilder().Species("A", 20).Species("B", 0).Mass("dimerise", "2 A -> B", "0.25").Compile();
        var constants = network.ConstantsFor([]);
        Assert.Equal(k * 20 * 19, network.Propensities.Evaluate(0, [20, 0], constants, []), 12);
        Assert.Equal(0.0, network.Propensities.Evaluate(0, [1, 0], constants, []));

        double[] x = [20, 0];
        var dxdt = new double[2];
        network.RateEquations.Derivative(x, constants, [], new double[1], dxdt);
        Assert.Equal(-2 * k * 20 * 20, dxdt[0], 12);
        Assert.Equal(k * 20 * 20, dxdt[1], 12);
    }

    [Fact]
    public void Constants_follow_a_changed_parameter()
    {
        // Parameters are read when the constants are computed, so a scheduled change takes effect
        var network = AllForms();
        var parameters = network.InitialParameterValues.ToArray();
        parameters[network.ParameterIndex("k1")] = 7.0;
        var constants = network.ConstantsFor(parameters);
        Assert.Equal(Gillespie(7.0, Size, (3, 1)), network.Propensities.Evaluate(1, [3, 0, 0], constants, parameters), 12);
        Assert.Equal(7.0 * 5 / (4 + 5), network.Propensities.Evaluate(6, [0, 0, 5], constants, parameters), 12);
    }
}
