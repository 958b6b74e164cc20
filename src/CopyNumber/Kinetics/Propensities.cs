using System.Runtime.CompilerServices;

namespace CopyNumber.Kinetics;

/// <summary>
/// The stochastic propensities a_j(x) in events per unit time, compiled once and shared by all threads.
/// Mass action follows Gillespie (1977, J. Phys. Chem. 81:2340): with macroscopic constant k, reactant
/// stoichiometries ν_i and system size Ω, a(x) = Ω·k·∏ ff(x_i, ν_i)/Ω^ν_i = c·∏ ff(x_i, ν_i) where
/// c = k·Ω^(1−order) and ff is the falling factorial. The constants c depend on the parameters (which a
/// schedule may change), so each simulator keeps its own copy, filled by <see cref="ComputeConstants"/>.
/// </summary>
public sealed class Propensities
{
    private readonly PropensityForm[] _form;
    private readonly int[] _speciesA;
    private readonly int[] _speciesB;
    private readonly int[][] _reactantSpecies;
    private readonly long[][] _reactantOrders;
    private readonly int[] _totalOrder;
    private readonly CountLaw?[] _rateLaws;
    private readonly StateLaw?[] _macroscopicConstants;
    private readonly double _size;

    /// <summary>Creates the propensities of a network; used by the network compiler.</summary>
    /// <param name="size">System size Ω.</param>
    /// <param name="reactants">Per reaction, its reactant species and stoichiometries (empty for <c>0 -> ...</c>).</param>
    /// <param name="macroscopicConstants">Per reaction, k as a law of the parameters for mass action; null for rate laws.</param>
    /// <param name="rateLaws">Per reaction, the compiled propensity for rate laws; null for mass action.</param>
    public Propensities(
        double size,
        IReadOnlyList<IReadOnlyList<(int Species, long Order)>> reactants,
        IReadOnlyList<StateLaw?> macroscopicConstants,
        IReadOnlyList<CountLaw?> rateLaws)
    {
        _size = size;
        var m = reactants.Count;
        Count = m;
        _form = new PropensityForm[m];
        _speciesA = new int[m];
        _speciesB = new int[m];
        _reactantSpecies = new int[m][];
        _reactantOrders = new long[m][];
        _totalOrder = new int[m];
        _rateLaws = rateLaws.ToArray();
        _macroscopicConstants = macroscopicConstants.ToArray();
        for (var j = 0; j < m; j++)
        {
            var list = reactants[j];
            _reactantSpecies[j] = list.Select(r => r.Species).ToArray();
            _reactantOrders[j] = list.Select(r => r.Order).ToArray();
            _totalOrder[j] = (int)list.Sum(r => r.Order);
            if (_rateLaws[j] is not null) { _form[j] = PropensityForm.RateLaw; continue; }
            _form[j] = list switch
            {
                { Count: 0 } => PropensityForm.Constant,
                [{ Order: 1 }] => PropensityForm.Unimolecular,
                [{ Order: 2 }] => PropensityForm.Homodimer,
                [{ Order: 1 }, { Order: 1 }] => PropensityForm.Bimolecular,
                _ => PropensityForm.GeneralMassAction,
            };
            if (list.Count > 0) _speciesA[j] = list[0].Species;
            if (list.Count > 1) _speciesB[j] = list[1].Species;
        }
    }

    /// <summary>Number of reactions.</summary>
    public int Count { get; }

    /// <summary>The compiled shape of reaction <paramref name="reaction"/>'s propensity.</summary>
    public PropensityForm Form(int reaction) => _form[reaction];

    /// <summary>Sum of reactant stoichiometries of a reaction (its molecularity).</summary>
    public int Order(int reaction) => _totalOrder[reaction];

    /// <summary>Reactant species and stoichiometries of a reaction.</summary>
    public IReadOnlyList<(int Species, long Order)> Reactants(int reaction) =>
        _reactantSpecies[reaction].Zip(_reactantOrders[reaction]).Select(p => (p.First, p.Second)).ToArray();

    /// <summary>
    /// Fills the stochastic constants c_j = k_j·Ω^(1−order_j) for the given parameters (0 for rate laws).
    /// Call again after a schedule event changes a parameter.
    /// </summary>
    public void ComputeConstants(double[] parameters, double[] constants)
    {
        for (var j = 0; j < Count; j++)
        {
            var k = _macroscopicConstants[j];
            constants[j] = k is null ? 0.0 : k([], parameters) * Math.Pow(_size, 1 - _totalOrder[j]);
        }
    }

    /// <summary>a_j(x) in events per unit time. Does not check the sign of a rate law's value.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public double Evaluate(int j, long[] counts, double[] constants, double[] parameters)
    {
        switch (_form[j])
        {
            case PropensityForm.Constant:
                return constants[j];
            case PropensityForm.Unimolecular:
                return constants[j] * counts[_speciesA[j]];
            case PropensityForm.Bimolecular:
                return constants[j] * counts[_speciesA[j]] * (double)counts[_speciesB[j]];
            case PropensityForm.Homodimer:
            {
                double x = counts[_speciesA[j]];
                return constants[j] * x * (x - 1.0);
            }
            case PropensityForm.GeneralMassAction:
                return EvaluateGeneral(j, counts, constants);
            default:
                return _rateLaws[j]!(counts, parameters);
        }
    }

    /// <summary>Evaluates every propensity into <paramref name="into"/>.</summary>
    public void EvaluateAll(long[] counts, double[] constants, double[] parameters, double[] into)
    {
        for (var j = 0; j < Count; j++) into[j] = Evaluate(j, counts, constants, parameters);
    }

    private double EvaluateGeneral(int j, long[] counts, double[] constants)
    {
        var a = constants[j];
        var species = _reactantSpecies[j];
        var orders = _reactantOrders[j];
        for (var r = 0; r < species.Length; r++)
        {
            double x = counts[species[r]];
            for (var q = 0L; q < orders[r]; q++) a *= x - q;
        }
        return a;
    }
}
