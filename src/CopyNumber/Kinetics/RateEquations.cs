namespace CopyNumber.Kinetics;

/// <summary>
/// The deterministic description dx/dt = N·v(x) in copy-number units, x real-valued. For mass action
/// v_j = Ω·k·∏ (x_i/Ω)^ν_i = c_j·∏ x_i^ν_i with the same c_j as the propensities; a <c>rate</c> law is used
/// as written. The Jacobian is exact: mass action is differentiated here, rate laws by the compiler's
/// symbolic derivatives.
/// </summary>
public sealed class RateEquations
{
    private readonly Network.Stoichiometry _n;
    private readonly Propensities _propensities;
    private readonly StateLaw?[] _rateLaws;
    private readonly (int Species, StateLaw Derivative)[][] _rateLawDerivatives;
    private readonly (int Species, long Order)[][] _reactants;
    private readonly Network.BurstProducts.Burst[] _bursts;

    /// <summary>Creates the rate equations; used by the network compiler.</summary>
    /// <param name="stoichiometry">N.</param>
    /// <param name="propensities">Supplies the mass-action constants c_j and reactant lists.</param>
    /// <param name="rateLaws">Per reaction, the rate law on a real state; null for mass action.</param>
    /// <param name="rateLawDerivatives">Per reaction, ∂v_j/∂x_i for each species i its rate law reads; empty for mass action.</param>
    /// <param name="bursts">Products made in bursts (N holds +1 for each; the rest of the mean, b − 1, is added here); null for none.</param>
    public RateEquations(
        Network.Stoichiometry stoichiometry,
        Propensities propensities,
        IReadOnlyList<StateLaw?> rateLaws,
        IReadOnlyList<IReadOnlyList<(int Species, StateLaw Derivative)>> rateLawDerivatives,
        Network.BurstProducts? bursts = null)
    {
        _bursts = bursts is null ? [] : [.. bursts.All];
        _n = stoichiometry;
        _propensities = propensities;
        _rateLaws = rateLaws.ToArray();
        _rateLawDerivatives = rateLawDerivatives.Select(d => d.ToArray()).ToArray();
        _reactants = Enumerable.Range(0, propensities.Count).Select(j => propensities.Reactants(j).ToArray()).ToArray();
    }

    /// <summary>Number of species (the dimension of x).</summary>
    public int SpeciesCount => _n.SpeciesCount;

    /// <summary>Number of reactions (the dimension of v).</summary>
    public int ReactionCount => _n.ReactionCount;

    /// <summary>The reaction rates v_j(x) in events per unit time, for constants from <see cref="Propensities.ComputeConstants"/>.</summary>
    public void Rates(double[] x, double[] constants, double[] parameters, double[] v)
    {
        for (var j = 0; j < v.Length; j++)
        {
            var law = _rateLaws[j];
            if (law is not null) { v[j] = law(x, parameters); continue; }
            var rate = constants[j];
            foreach (var (species, order) in _reactants[j])
                rate *= IntegerPower(x[species], order);
            v[j] = rate;
        }
    }

    /// <summary>dx/dt = N·v(x), in copies per unit time; <paramref name="v"/> is scratch of length <see cref="ReactionCount"/>.</summary>
    public void Derivative(double[] x, double[] constants, double[] parameters, double[] v, double[] dxdt)
    {
        Rates(x, constants, parameters, v);
        Array.Clear(dxdt);
        for (var j = 0; j < v.Length; j++)
        {
            var species = _n.ChangedSpecies(j);
            var change = _n.Changes(j);
            for (var e = 0; e < species.Length; e++) dxdt[species[e]] += change[e] * v[j];
        }
        // A burst of mean b: N holds +1, so b − 1 more copies per event on average.
        foreach (var burst in _bursts) dxdt[burst.Species] += (burst.Mean([], parameters) - 1) * v[burst.Reaction];
    }

    /// <summary>∂v_j/∂x_i, reactions × species, exact.</summary>
    public void RateJacobian(double[] x, double[] constants, double[] parameters, double[,] dvdx)
    {
        Array.Clear(dvdx);
        for (var j = 0; j < ReactionCount; j++)
        {
            if (_rateLaws[j] is not null)
            {
                foreach (var (species, derivative) in _rateLawDerivatives[j])
                    dvdx[j, species] = derivative(x, parameters);
                continue;
            }
            var reactants = _reactants[j];
            for (var r = 0; r < reactants.Length; r++)
            {
                var (species, order) = reactants[r];
                var d = constants[j] * order * IntegerPower(x[species], order - 1);
                for (var q = 0; q < reactants.Length; q++)
                    if (q != r) d *= IntegerPower(x[reactants[q].Species], reactants[q].Order);
                dvdx[j, species] += d;
            }
        }
    }

    /// <summary>The Jacobian of dx/dt, J = N·∂v/∂x (species × species); <paramref name="dvdx"/> is scratch.</summary>
    public void Jacobian(double[] x, double[] constants, double[] parameters, double[,] dvdx, double[,] jacobian)
    {
        RateJacobian(x, constants, parameters, dvdx);
        Array.Clear(jacobian);
        for (var j = 0; j < ReactionCount; j++)
        {
            var species = _n.ChangedSpecies(j);
            var change = _n.Changes(j);
            for (var e = 0; e < species.Length; e++)
                for (var k = 0; k < SpeciesCount; k++)
                    jacobian[species[e], k] += change[e] * dvdx[j, k];
        }
        foreach (var burst in _bursts)
        {
            var extra = burst.Mean([], parameters) - 1;
            for (var k = 0; k < SpeciesCount; k++) jacobian[burst.Species, k] += extra * dvdx[burst.Reaction, k];
        }
    }

    private static double IntegerPower(double x, long n)
    {
        var result = 1.0;
        for (var q = 0L; q < n; q++) result *= x;
        return result;
    }
}
